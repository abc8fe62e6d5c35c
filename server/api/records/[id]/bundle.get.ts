import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The RecordBundle (shared/records) of a signed version (?version=N, default the newest): the
 * record, its hash, the signatures and the public keys they use. verifyBundle checks it offline.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const { version: number } = await validQuery(event, versionQuerySchema)
  await readableEntry(person, id)
  const database = useDatabase()
  const version = await signingFrozenVersion(database, id, number)
  if (!version)
    throw createError({ statusCode: 404, message: number ? `Version ${number} of this entry has not been signed.` : 'This entry has no signed version yet.' })
  try {
    return await signingBundleOf(database, version)
  }
  catch (error) {
    // Only stored rows altered behind the triggers' back get here; verify says what is wrong.
    throw createError({ statusCode: 409, message: `The stored version cannot be exported as a valid bundle (${error instanceof Error ? error.message : String(error)}). Verify it to see what was altered.` })
  }
})
