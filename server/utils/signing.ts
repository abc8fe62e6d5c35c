import { and, asc, desc, eq, isNull, lte, or, gt } from 'drizzle-orm'
import {
  CalculationBlockError,
  base64ToBytes,
  buildEntryRecord,
  recordHash as hashRecord,
  statementBytes,
} from '#shared/records'
import type { RecordDocument, SignatureEnvelope, SigningMeaning } from '#shared/records'
import { STATEMENT_TEXTS } from '#shared/schemas/signing'
import {
  attachments,
  entries,
  entryVersions,
  notebooks,
  signatures,
  signingChallenges,
  signingKeys,
  witnessRequests,
  type Entry,
  type SigningChallenge,
  type SigningKey,
} from '../database/schema'
import type { SessionPerson } from './auth'
import type { Database } from './db'
import { ed25519Verify } from './ed25519'

// Shared steps of the signing routes. Exports are prefixed "signing" so Nitro's auto-imports
// cannot collide with another area's helpers.

type Reader = Pick<Database, 'select'>

/** The signer as a statement names them. */
export function signingPersonOf(person: SessionPerson) {
  return { id: person.id, name: person.name, email: person.email }
}

/** The attachments that belong to an entry version: present at `at` (or now, for a draft). */
export async function signingAttachmentsAt(database: Reader, entryId: string, at: Date | null) {
  const present = at === null
    ? isNull(attachments.detachedAt)
    : and(lte(attachments.uploadedAt, at), or(isNull(attachments.detachedAt), gt(attachments.detachedAt, at)))
  return database.select({ name: attachments.name, mediaType: attachments.mediaType, size: attachments.size, sha256: attachments.sha256 })
    .from(attachments).where(and(eq(attachments.entryId, entryId), present)).orderBy(asc(attachments.name))
}

/**
 * The record of the entry's current draft, with the server's engine. A block that does not
 * compute is refused (422) with each block named: a signed record must compute.
 */
export async function signingRecordOfDraft(database: Reader, entry: Entry): Promise<{ record: RecordDocument, recordHash: string }> {
  const [notebook] = await database.select({ id: notebooks.id, name: notebooks.name }).from(notebooks).where(eq(notebooks.id, entry.notebookId))
  const files = await signingAttachmentsAt(database, entry.id, null)
  try {
    const record = buildEntryRecord({ entry, notebook: notebook!, attachments: files })
    return { record, recordHash: await hashRecord(record) }
  }
  catch (error) {
    if (error instanceof CalculationBlockError) {
      throw createError({
        statusCode: 422,
        message: `This entry cannot be signed until every calculation block computes: ${error.message}`,
        data: { problems: error.problems },
      })
    }
    throw error
  }
}

/**
 * THE rule for whether a registered key may make a new signature: it is active (not retired)
 * and confirmed. A person's first key is confirmed when registered; every later key waits for
 * a records officer other than its owner to confirm it with a reason (POST
 * /api/keys/:id/confirm), so that whoever holds a person's session and password cannot put a
 * key of their own in that person's name and sign at once. Retired keys still verify what they
 * signed; this only decides new signatures. Answers { ok: true } or the refusal, with why.
 */
export function signingKeyMaySign(key: Pick<SigningKey, 'retiredAt' | 'retiredReason' | 'confirmedAt'>): { ok: true } | { ok: false, statusCode: 403, message: string } {
  if (key.retiredAt !== null)
    return { ok: false, statusCode: 403, message: `That signing key was retired on ${key.retiredAt.toISOString()} (${key.retiredReason ?? 'no reason'}); sign with your active key.` }
  if (key.confirmedAt === null)
    return { ok: false, statusCode: 403, message: 'Your new signing key waits for a records officer to confirm it; it cannot sign until then.' }
  return { ok: true }
}

/** Throws the refusal of signingKeyMaySign (403), for routes. */
export function signingRequireKeyMaySign(key: Pick<SigningKey, 'retiredAt' | 'retiredReason' | 'confirmedAt'>): void {
  const verdict = signingKeyMaySign(key)
  if (!verdict.ok)
    throw createError({ statusCode: verdict.statusCode, message: verdict.message })
}

/** The person's one active key, if any. */
export async function signingActiveKey(database: Reader, personId: string): Promise<SigningKey | undefined> {
  const [key] = await database.select().from(signingKeys)
    .where(and(eq(signingKeys.personId, personId), isNull(signingKeys.retiredAt))).limit(1)
  return key
}

/** The newest frozen version of an entry, or a named one. */
export async function signingFrozenVersion(database: Reader, entryId: string, version?: number) {
  const [row] = await database.select().from(entryVersions)
    .where(version === undefined ? eq(entryVersions.entryId, entryId) : and(eq(entryVersions.entryId, entryId), eq(entryVersions.version, version)))
    .orderBy(desc(entryVersions.version)).limit(1)
  return row
}

/** The witness request addressed to this person for this version that is still open. */
export async function signingOpenRequestFor(database: Reader, entryId: string, version: number, witnessId: string) {
  const [row] = await database.select().from(witnessRequests).where(and(
    eq(witnessRequests.entryId, entryId), eq(witnessRequests.version, version),
    eq(witnessRequests.witnessId, witnessId), isNull(witnessRequests.resolvedAt),
  )).limit(1)
  return row
}

function fieldError(path: string, message: string, statusCode = 400): never {
  throw createError({ statusCode, message: `${path}: ${message}`, data: { issues: [{ path, message }] } })
}

/**
 * The checks every signature must pass before anything is stored, in the order a person can
 * act on: the statement's wording and signer, the key (registered, theirs, and allowed to sign
 * by signingKeyMaySign: active and confirmed), the
 * Ed25519 signature, then the challenge (theirs, for this entry and meaning, unused, unexpired,
 * and the statement's time and record hash are the challenge's). Answers:
 * 400 naming the field, 403 for a key that is not the signer's active key,
 * 409 for a challenge already used, 410 for an expired one.
 */
export async function signingCheckEnvelope(
  database: Reader,
  person: SessionPerson,
  entryId: string,
  meaning: 'authored' | 'witnessed',
  envelope: SignatureEnvelope,
): Promise<{ key: SigningKey, challenge: SigningChallenge }> {
  const { statement } = envelope
  if (statement.meaning !== meaning)
    fieldError('envelope.statement.meaning', `this route takes a statement with meaning '${meaning}'`)
  if (statement.statement !== STATEMENT_TEXTS[meaning])
    fieldError('envelope.statement.statement', `expected the ${meaning} statement text: "${STATEMENT_TEXTS[meaning]}"`)
  if (statement.signer.id !== person.id)
    throw createError({ statusCode: 403, message: 'You can sign only as yourself: the statement names another signer.' })
  if (statement.signer.name !== person.name || statement.signer.email !== person.email)
    fieldError('envelope.statement.signer', `expected your name and e-mail as the app knows them (${person.name}, ${person.email})`)

  const [key] = await database.select().from(signingKeys).where(eq(signingKeys.fingerprint, statement.keyFingerprint)).limit(1)
  if (!key || key.personId !== person.id)
    throw createError({ statusCode: 403, message: 'The statement names a key that is not one of your signing keys.' })
  signingRequireKeyMaySign(key)
  if (envelope.publicKey !== key.publicKey)
    fieldError('envelope.publicKey', 'is not the key the statement names by its fingerprint')
  if (!ed25519Verify(statementBytes(statement), base64ToBytes(envelope.signature), base64ToBytes(key.publicKey)))
    fieldError('envelope.signature', 'does not verify: the statement was changed after signing, or another key signed it')

  const [challenge] = await database.select().from(signingChallenges).where(eq(signingChallenges.nonce, statement.challenge)).limit(1)
  if (!challenge || challenge.personId !== person.id || challenge.entryId !== entryId || challenge.meaning !== meaning)
    fieldError('envelope.statement.challenge', `is not a challenge issued to you for ${meaning === 'authored' ? 'signing' : 'countersigning'} this entry`)
  if (challenge.usedAt !== null)
    throw createError({ statusCode: 409, message: 'This signing challenge was already used. Ask for a new one and sign again.' })
  if (challenge.expiresAt.getTime() <= Date.now())
    throw createError({ statusCode: 410, message: 'This signing challenge has expired. Ask for a new one and sign again.' })
  if (statement.signedAt !== challenge.issuedAt.toISOString())
    fieldError('envelope.statement.signedAt', `expected the challenge's time ${challenge.issuedAt.toISOString()}`)
  if (statement.recordHash !== challenge.recordHash)
    fieldError('envelope.statement.recordHash', `expected the record hash the challenge names (${challenge.recordHash})`)
  return { key, challenge }
}

/** Marks a challenge used inside the signing transaction; a second use loses the race (409). */
export async function signingConsumeChallenge(tx: Pick<Database, 'update'>, challengeId: string) {
  const used = await tx.update(signingChallenges).set({ usedAt: new Date() })
    .where(and(eq(signingChallenges.id, challengeId), isNull(signingChallenges.usedAt))).returning({ id: signingChallenges.id })
  if (used.length === 0)
    throw createError({ statusCode: 409, message: 'This signing challenge was already used. Ask for a new one and sign again.' })
}

/** Locks the entry row for the rest of the transaction and returns it as it is now. */
export async function signingLockEntry(tx: Pick<Database, 'select'>, entryId: string): Promise<Entry> {
  const [row] = await tx.select().from(entries).where(eq(entries.id, entryId)).for('update')
  return row!
}

/** True for PostgreSQL's unique_violation (23505), however drizzle wraps it. */
export function signingIsUniqueViolation(error: unknown): boolean {
  let current: unknown = error
  for (let depth = 0; depth < 4 && current; depth++) {
    if ((current as { code?: string }).code === '23505')
      return true
    current = (current as { cause?: unknown }).cause
  }
  return false
}

/** A signature row as the envelope that was signed, with its server id. */
export function signingEnvelopeOf(row: { id: string, statement: unknown, signature: string }, publicKey: string): SignatureEnvelope {
  return { statement: row.statement as SignatureEnvelope['statement'], signature: row.signature, publicKey, id: row.id }
}

/** Signatures of a frozen version with their keys, oldest first. */
export async function signingSignaturesOf(database: Reader, entryVersionId: string) {
  return database.select({ signature: signatures, key: signingKeys }).from(signatures)
    .innerJoin(signingKeys, eq(signingKeys.id, signatures.keyId))
    .where(eq(signatures.entryVersionId, entryVersionId)).orderBy(asc(signatures.signedAt), asc(signatures.id))
}

export type { SigningMeaning }
