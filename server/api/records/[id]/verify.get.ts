import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/** Verifies a signed version of an entry (?version=N, default the newest signed one) from what is stored. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const { version: number } = await validQuery(event, versionQuerySchema)
  const entry = await readableEntry(person, id)
  const database = useDatabase()
  const version = await signingFrozenVersion(database, id, number)
  if (!version)
    throw createError({ statusCode: 404, message: number ? `Version ${number} of this entry has not been signed.` : 'This entry has no signed version yet.' })
  return signingVerifyRecord(database, entry, version)
})
