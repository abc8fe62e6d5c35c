import { z } from 'zod'
import { eq, sql } from 'drizzle-orm'
import { statementHash } from '#shared/records'
import { signBodySchema } from '#shared/schemas/signing'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries, entryVersions, signatures } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The author's signature. Every check runs before anything is written; then one transaction
 * consumes the challenge, freezes the version, stores the signature, moves the entry to
 * "signed — awaiting witness" and writes the audit event.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const { envelope } = await validBody(event, signBodySchema)
  const entry = await readableEntry(person, id)
  if (entry.authorId !== person.id)
    throw createError({ statusCode: 403, message: 'Only the author signs an entry.' })
  const database = useDatabase()
  const { key, challenge } = await signingCheckEnvelope(database, person, entry.id, 'authored', envelope)
  if (entry.state !== 'draft' || entry.version !== challenge.version)
    throw createError({ statusCode: 409, message: 'This version is no longer the current draft; it was signed or amended meanwhile.' })
  const signedHash = await statementHash(envelope.statement)

  try {
    const outcome = await database.transaction(async (tx) => {
      const current = await signingLockEntry(tx, entry.id)
      if (current.state !== 'draft' || current.version !== challenge.version)
        throw createError({ statusCode: 409, message: 'This version is no longer the current draft; it was signed or amended meanwhile.' })
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
      const frozenAt = version!.frozenAt
      const [signature] = await tx.insert(signatures).values({
        entryVersionId: version!.id, signerId: person.id, keyId: key.id, meaning: 'authored',
        statement: envelope.statement, statementHash: signedHash, signature: envelope.signature,
        signedAt: challenge.issuedAt,
      }).returning()
      const [updated] = await tx.update(entries).set({ state: 'awaiting_witness', lockVersion: current.lockVersion + 1, updatedAt: frozenAt })
        .where(eq(entries.id, current.id)).returning()
      await recordAudit(database, {
        action: 'entry_signed', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
        details: { version: current.version, recordHash, signatureId: signature!.id, statementHash: signedHash, keyFingerprint: key.fingerprint },
      }, tx)
      return { entry: updated!, version: version!, signature: signature! }
    })
    setResponseStatus(event, 201)
    return {
      entry: { id: outcome.entry.id, state: outcome.entry.state, version: outcome.entry.version, lockVersion: outcome.entry.lockVersion },
      version: { version: outcome.version.version, recordHash: outcome.version.recordHash, frozenAt: outcome.version.frozenAt },
      signature: { id: outcome.signature.id, meaning: outcome.signature.meaning, signedAt: outcome.signature.signedAt, statementHash: signedHash },
    }
  }
  catch (error) {
    if (signingIsUniqueViolation(error))
      throw createError({ statusCode: 409, message: 'This version was signed meanwhile.' })
    throw error
  }
})
