import { randomBytes } from 'node:crypto'
import { and, eq } from 'drizzle-orm'
import { z } from 'zod'
import { statementHash } from '#shared/records'
import type { RecordDocument, SigningStatement } from '#shared/records'
import { CHALLENGE_MINUTES, STATEMENT_TEXTS, challengeBodySchema } from '#shared/schemas/signing'
import { uuidSchema } from '#shared/schemas/notebooks'
import { signatures, signingChallenges } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * A single-use signing challenge: the record the server will freeze, its hash, the server's
 * time and a nonce, valid for a few minutes. The browser rebuilds the hash from what it shows
 * and signs only if both agree; the statement's signedAt and challenge come from here.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const { meaning } = await validBody(event, challengeBodySchema)
  const entry = await lifecycleAllowed(person, id, meaning === 'authored' ? 'sign' : 'countersign')
  const database = useDatabase()

  let record: RecordDocument
  let recordHash: string
  let countersigns: string | undefined
  if (meaning === 'authored') {
    ;({ record, recordHash } = await signingRecordOfDraft(database, entry))
  }
  else {
    const version = (await signingFrozenVersion(database, entry.id, entry.version))!
    const [authored] = await database.select().from(signatures)
      .where(and(eq(signatures.entryVersionId, version.id), eq(signatures.meaning, 'authored'))).limit(1)
    record = version.record as RecordDocument
    recordHash = version.recordHash
    countersigns = await statementHash(authored!.statement as SigningStatement)
  }

  const key = await signingActiveKey(database, person.id)
  if (!key)
    throw createError({ statusCode: 409, message: 'You have no active signing key. Make one on the signing keys page first.' })
  signingRequireKeyMaySign(key)

  const issuedAt = new Date()
  const expiresAt = new Date(issuedAt.getTime() + CHALLENGE_MINUTES * 60_000)
  const nonce = randomBytes(32).toString('base64url')
  await database.insert(signingChallenges).values({
    nonce, personId: person.id, entryId: entry.id, version: entry.version, meaning, recordHash, issuedAt, expiresAt,
  })
  return {
    meaning,
    version: entry.version,
    record,
    recordHash,
    nonce,
    issuedAt: issuedAt.toISOString(),
    expiresAt: expiresAt.toISOString(),
    statementText: STATEMENT_TEXTS[meaning],
    signer: signingPersonOf(person),
    keyFingerprint: key.fingerprint,
    ...(countersigns ? { countersigns } : {}),
  }
})
