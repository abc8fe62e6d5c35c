import { and, eq, isNull, ne, sql } from 'drizzle-orm'
import { statementHash } from '#shared/records'
import type { SignatureEnvelope, SigningStatement } from '#shared/records'
import type { LifecycleAction } from '#shared/records/lifecycle'
import { entries, entryVersions, people, signatures, witnessRequests } from '../database/schema'
import type { SessionPerson } from './auth'
import type { Database } from './db'
import type { EntryWithState } from './lifecycle'

// The transitions of an entry's life, one function each: sign, request a witness,
// countersign, decline, amend. Each checks mayDo (shared/records/lifecycle.ts) before anything
// is read for it and again under the entry's row lock, then writes the change and its audit
// event in one transaction. The routes only authenticate, validate, call and answer.

type Transaction = Parameters<Parameters<Database['transaction']>[0]>[0]

/** Locks the entry row for the rest of the transaction, derives its state now and checks the action again. */
async function lockAndCheck(tx: Transaction, person: SessionPerson, entryId: string, action: LifecycleAction, expectedVersion: number): Promise<EntryWithState> {
  const current = await lifecycleWithState(tx, await signingLockEntry(tx, entryId))
  if (current.version !== expectedVersion)
    throw createError({ statusCode: 409, message: 'This entry changed meanwhile (it was signed, amended or decided on). Reload it.' })
  lifecycleRequire(action, person, await lifecycleEntryFor(person, current))
  return current
}

/** The author's signature: freezes the version the challenge names, stores the signature and audits it. */
export async function transitionSign(person: SessionPerson, entryId: string, envelope: SignatureEnvelope) {
  const entry = await lifecycleAllowed(person, entryId, 'sign')
  const database = useDatabase()
  const { key, challenge } = await signingCheckEnvelope(database, person, entry.id, 'authored', envelope)
  if (entry.version !== challenge.version)
    throw createError({ statusCode: 409, message: 'This version is no longer the current draft; it was signed or amended meanwhile.' })
  const signedHash = await statementHash(envelope.statement)
  try {
    return await database.transaction(async (tx) => {
      const current = await lockAndCheck(tx, person, entry.id, 'sign', challenge.version)
      const { record, recordHash } = await signingRecordOfDraft(tx, current)
      if (recordHash !== challenge.recordHash)
        throw createError({ statusCode: 409, message: 'The entry changed after the challenge was issued. Reload it, check it, and sign again.' })
      await signingConsumeChallenge(tx, challenge.id)
      // The database's clock, read after the entry lock is held: the attachments that belong to
      // the version are exactly those uploaded (by database time) before it and not detached.
      const [version] = await tx.insert(entryVersions).values({
        entryId: current.id, version: current.version, supersedesVersion: current.supersedesVersion,
        title: current.title, content: current.content, record, recordHash, frozenAt: sql`clock_timestamp()`, frozenBy: person.id,
      }).returning()
      const [signature] = await tx.insert(signatures).values({
        entryVersionId: version!.id, signerId: person.id, keyId: key.id, meaning: 'authored',
        statement: envelope.statement, statementHash: signedHash, signature: envelope.signature,
        signedAt: challenge.issuedAt,
      }).returning()
      const [updated] = await tx.update(entries).set({ lockVersion: current.lockVersion + 1, updatedAt: version!.frozenAt })
        .where(eq(entries.id, current.id)).returning()
      await recordAudit(database, {
        action: 'entry_signed', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
        details: { version: current.version, title: current.title, recordHash, signatureId: signature!.id, statementHash: signedHash, keyFingerprint: key.fingerprint },
      }, tx)
      return { entry: { ...updated!, state: 'awaiting_witness' as const }, version: version!, signature: signature!, statementHash: signedHash }
    })
  }
  catch (error) {
    if (signingIsUniqueViolation(error))
      throw createError({ statusCode: 409, message: 'This version was signed meanwhile.' })
    throw error
  }
}

/** The author asks a witness (who holds the role, belongs to the notebook and is not the author). */
export async function transitionRequestWitness(person: SessionPerson, entryId: string, witnessId: string) {
  const entry = await lifecycleAllowed(person, entryId, 'requestWitness')
  if (witnessId === person.id)
    throw createError({ statusCode: 403, message: 'Nobody witnesses their own entry: choose someone else.' })
  const witness = await findPerson(witnessId)
  if (!witness || witness.disabled)
    validationError([{ path: 'witnessId', message: 'no such person' }], 'body')
  if (!witness.roles.includes('witness'))
    validationError([{ path: 'witnessId', message: `${witness.name} does not hold the witness role` }], 'body')
  if (!(await isMember(entry.notebookId, witness.id)))
    validationError([{ path: 'witnessId', message: `${witness.name} does not belong to this notebook` }], 'body')

  const database = useDatabase()
  const request = await database.transaction(async (tx) => {
    await lockAndCheck(tx, person, entry.id, 'requestWitness', entry.version)
    const [open] = await tx.select({ id: witnessRequests.id }).from(witnessRequests).where(and(
      eq(witnessRequests.entryId, entry.id), eq(witnessRequests.version, entry.version),
      eq(witnessRequests.witnessId, witness.id), isNull(witnessRequests.resolvedAt),
    )).limit(1)
    if (open)
      throw createError({ statusCode: 409, message: `${witness.name} has already been asked to witness this version.` })
    const [row] = await tx.insert(witnessRequests).values({
      entryId: entry.id, version: entry.version, requestedBy: person.id, witnessId: witness.id,
    }).returning()
    await recordAudit(database, {
      action: 'witness_requested', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: entry.id,
      details: { version: entry.version, title: entry.title, witnessId: witness.id, witnessEmail: witness.email, requestId: row!.id },
    }, tx)
    return row!
  })

  const mailed = await mailSendAudited({
    to: witness.email,
    subject: `Witness request: ${entry.title}`,
    text: [
      `${witness.name},`,
      '',
      `${person.name} has signed version ${entry.version} of "${entry.title}" and asks you to witness it.`,
      'Read it, check that its calculation blocks recompute, then countersign it or decline with a reason:',
      '',
      mailLink(`/entries/${entry.id}`),
      '',
      'Thermotome',
    ].join('\n'),
  }, { actor: person, entryId: entry.id, purpose: 'witness_request' })
  return { request, witness, mailed }
}

/** A witness's countersignature ("read and understood"), naming the author's statement by its hash. */
export async function transitionCountersign(person: SessionPerson, entryId: string, envelope: SignatureEnvelope, acknowledgedDifferences?: string[]) {
  const entry = await lifecycleAllowed(person, entryId, 'countersign')
  const database = useDatabase()
  const { key, challenge } = await signingCheckEnvelope(database, person, entry.id, 'witnessed', envelope)
  if (entry.version !== challenge.version)
    throw createError({ statusCode: 409, message: 'This version is no longer waiting for a witness: it was countersigned, declined or amended meanwhile.' })
  const version = (await signingFrozenVersion(database, entry.id, entry.version))!
  const [authored] = await database.select().from(signatures)
    .where(and(eq(signatures.entryVersionId, version.id), eq(signatures.meaning, 'authored'))).limit(1)
  const authoredHash = await statementHash(authored!.statement as SigningStatement)
  if (envelope.statement.countersigns !== authoredHash)
    validationError([{ path: 'envelope.statement.countersigns', message: `expected the hash of the author's statement (${authoredHash})` }], 'body')
  const signedHash = await statementHash(envelope.statement)
  try {
    return await database.transaction(async (tx) => {
      const current = await lockAndCheck(tx, person, entry.id, 'countersign', challenge.version)
      const request = (await signingOpenRequestFor(tx, current.id, current.version, person.id))!
      await signingConsumeChallenge(tx, challenge.id)
      const now = new Date()
      const [signature] = await tx.insert(signatures).values({
        entryVersionId: version.id, signerId: person.id, keyId: key.id, meaning: 'witnessed',
        statement: envelope.statement, statementHash: signedHash, signature: envelope.signature,
        signedAt: challenge.issuedAt, countersignsId: authored!.id,
      }).returning()
      const [updated] = await tx.update(entries).set({ lockVersion: current.lockVersion + 1, updatedAt: now })
        .where(eq(entries.id, current.id)).returning()
      await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'countersigned' }).where(eq(witnessRequests.id, request.id))
      await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'closed: witnessed by someone else' }).where(and(
        eq(witnessRequests.entryId, current.id), eq(witnessRequests.version, current.version),
        isNull(witnessRequests.resolvedAt), ne(witnessRequests.id, request.id),
      ))
      await recordAudit(database, {
        action: 'entry_witnessed', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
        details: { version: current.version, title: current.title, recordHash: version.recordHash, signatureId: signature!.id, statementHash: signedHash, countersigns: authored!.id, keyFingerprint: key.fingerprint, ...(acknowledgedDifferences?.length ? { acknowledgedDifferences } : {}) },
      }, tx)
      return { entry: { ...updated!, state: 'witnessed' as const }, signature: signature!, statementHash: signedHash, countersigns: authored!.id }
    })
  }
  catch (error) {
    if (signingIsUniqueViolation(error))
      throw createError({ statusCode: 409, message: 'Another witness countersigned this version first.' })
    throw error
  }
}

/** The asked witness declines, with a reason; the author is told by e-mail after the change commits. */
export async function transitionDecline(person: SessionPerson, entryId: string, reason: string) {
  const entry = await lifecycleAllowed(person, entryId, 'decline')
  const database = useDatabase()
  const updated = await database.transaction(async (tx) => {
    const current = await lockAndCheck(tx, person, entry.id, 'decline', entry.version)
    const request = (await signingOpenRequestFor(tx, current.id, current.version, person.id))!
    const now = new Date()
    const [row] = await tx.update(entries).set({ lockVersion: current.lockVersion + 1, updatedAt: now })
      .where(eq(entries.id, current.id)).returning()
    await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'declined', reason }).where(eq(witnessRequests.id, request.id))
    await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'closed: declined by another witness' }).where(and(
      eq(witnessRequests.entryId, current.id), eq(witnessRequests.version, current.version),
      isNull(witnessRequests.resolvedAt), ne(witnessRequests.id, request.id),
    ))
    await recordAudit(database, {
      action: 'entry_declined', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
      details: { version: current.version, title: current.title, reason, requestId: request.id },
    }, tx)
    return { ...row!, state: 'declined' as const }
  })

  const [author] = await database.select({ name: people.name, email: people.email }).from(people).where(eq(people.id, entry.authorId))
  const mailed = await mailSendAudited({
    to: author!.email,
    subject: `Declined: ${entry.title}`,
    text: [
      `${author!.name},`,
      '',
      `${person.name} declined to witness version ${entry.version} of "${entry.title}".`,
      '',
      'Their reason:',
      reason,
      '',
      'You can amend the entry and sign the new version:',
      mailLink(`/entries/${entry.id}`),
      '',
      'Thermotome',
    ].join('\n'),
  }, { actor: person, entryId: entry.id, purpose: 'declined' })
  return { entry: updated, mailed }
}

/**
 * Starts an amendment: the signed version stays frozen (and is shown as superseded); the entry
 * becomes a new draft version that names the version it supersedes.
 */
export async function transitionAmend(person: SessionPerson, entryId: string, reason: string | undefined) {
  const entry = await lifecycleAllowed(person, entryId, 'amend')
  const database = useDatabase()
  return database.transaction(async (tx) => {
    const current = await lockAndCheck(tx, person, entry.id, 'amend', entry.version)
    const now = new Date()
    const [row] = await tx.update(entries).set({
      version: current.version + 1, supersedesVersion: current.version,
      lockVersion: current.lockVersion + 1, updatedAt: now,
    }).where(eq(entries.id, current.id)).returning()
    await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'closed: amended' }).where(and(
      eq(witnessRequests.entryId, current.id), eq(witnessRequests.version, current.version), isNull(witnessRequests.resolvedAt),
    ))
    await recordAudit(database, {
      action: 'entry_amended', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
      details: { supersedes: current.version, version: current.version + 1, title: current.title, previousState: current.state, reason: reason || null },
    }, tx)
    return { ...row!, state: 'draft' as const }
  })
}
