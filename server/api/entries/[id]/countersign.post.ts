import { and, eq, isNull, ne } from 'drizzle-orm'
import { z } from 'zod'
import { statementHash } from '#shared/records'
import type { SigningStatement } from '#shared/records'
import { uuidSchema } from '#shared/schemas/notebooks'
import { signBodySchema } from '#shared/schemas/signing'
import { entries, signatures, witnessRequests } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * A witness's countersignature ("read and understood") on the signed version, naming the
 * author's statement by its hash. Two witnesses at once: the entry row lock and the unique
 * index signatures_one_witness let exactly one through; the other gets 409.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'witness')
  const { id } = await validParams(event, paramsSchema)
  const { envelope } = await validBody(event, signBodySchema)
  const entry = await readableEntry(person, id)
  if (entry.authorId === person.id)
    throw createError({ statusCode: 403, message: 'Nobody witnesses their own entry.' })
  if (!(await isMember(entry.notebookId, person.id)))
    throw createError({ statusCode: 403, message: 'Only a witness who belongs to this notebook countersigns its entries.' })
  const database = useDatabase()
  const { key, challenge } = await signingCheckEnvelope(database, person, entry.id, 'witnessed', envelope)
  if (entry.state !== 'awaiting_witness' || entry.version !== challenge.version)
    throw createError({ statusCode: 409, message: 'This version is no longer waiting for a witness: it was countersigned, declined or amended meanwhile.' })
  const request = await signingOpenRequestFor(database, entry.id, entry.version, person.id)
  if (!request)
    throw createError({ statusCode: 403, message: 'The author has not asked you to witness this version.' })
  const version = (await signingFrozenVersion(database, entry.id, entry.version))!
  const [authored] = await database.select().from(signatures)
    .where(and(eq(signatures.entryVersionId, version.id), eq(signatures.meaning, 'authored'))).limit(1)
  const authoredHash = await statementHash(authored!.statement as SigningStatement)
  if (envelope.statement.countersigns !== authoredHash)
    validationError([{ path: 'envelope.statement.countersigns', message: `expected the hash of the author's statement (${authoredHash})` }], 'body')
  const signedHash = await statementHash(envelope.statement)

  try {
    const outcome = await database.transaction(async (tx) => {
      const current = await signingLockEntry(tx, entry.id)
      if (current.state !== 'awaiting_witness' || current.version !== challenge.version)
        throw createError({ statusCode: 409, message: 'This version is no longer waiting for a witness: it was countersigned, declined or amended meanwhile.' })
      await signingConsumeChallenge(tx, challenge.id)
      const now = new Date()
      const [signature] = await tx.insert(signatures).values({
        entryVersionId: version.id, signerId: person.id, keyId: key.id, meaning: 'witnessed',
        statement: envelope.statement, statementHash: signedHash, signature: envelope.signature,
        signedAt: challenge.issuedAt, countersignsId: authored!.id,
      }).returning()
      const [updated] = await tx.update(entries).set({ state: 'witnessed', lockVersion: current.lockVersion + 1, updatedAt: now })
        .where(eq(entries.id, current.id)).returning()
      await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'countersigned' }).where(eq(witnessRequests.id, request.id))
      await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'closed: witnessed by someone else' }).where(and(
        eq(witnessRequests.entryId, current.id), eq(witnessRequests.version, current.version),
        isNull(witnessRequests.resolvedAt), ne(witnessRequests.id, request.id),
      ))
      await recordAudit(database, {
        action: 'entry_witnessed', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
        details: { version: current.version, recordHash: version.recordHash, signatureId: signature!.id, statementHash: signedHash, countersigns: authored!.id, keyFingerprint: key.fingerprint },
      }, tx)
      return { entry: updated!, signature: signature! }
    })
    setResponseStatus(event, 201)
    return {
      entry: { id: outcome.entry.id, state: outcome.entry.state, version: outcome.entry.version, lockVersion: outcome.entry.lockVersion },
      signature: { id: outcome.signature.id, meaning: outcome.signature.meaning, signedAt: outcome.signature.signedAt, statementHash: signedHash, countersigns: authored!.id },
    }
  }
  catch (error) {
    if (signingIsUniqueViolation(error))
      throw createError({ statusCode: 409, message: 'Another witness countersigned this version first.' })
    throw error
  }
})
