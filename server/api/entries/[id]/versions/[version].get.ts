import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { people } from '../../../../database/schema'

const paramsSchema = z.object({
  id: uuidSchema,
  version: z.coerce.number({ error: 'expected a version number' }).int('expected a whole version number').min(1, 'versions start at 1').max(1_000_000),
})

/** One frozen version exactly as signed: content, record, hash and every signature envelope. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id, version: number } = await validParams(event, paramsSchema)
  const entry = await readableEntry(person, id)
  const database = useDatabase()
  const version = await signingFrozenVersion(database, id, number)
  if (!version)
    throw createError({ statusCode: 404, message: `Version ${number} of this entry has not been signed.` })
  const [frozenBy] = await database.select({ id: people.id, name: people.name }).from(people).where(eq(people.id, version.frozenBy))
  const rows = await signingSignaturesOf(database, version.id)
  return {
    version: {
      version: version.version, supersedesVersion: version.supersedesVersion, title: version.title, content: version.content,
      record: version.record, recordHash: version.recordHash, frozenAt: version.frozenAt, frozenBy,
      status: lifecycleVersionStatus(version.version, entry),
    },
    signatures: rows.map(({ signature, key }) => ({
      ...signingEnvelopeOf(signature, key.publicKey),
      meaning: signature.meaning, signedAt: signature.signedAt, signerId: signature.signerId, countersignsId: signature.countersignsId,
    })),
  }
})
