import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The RecordBundle (shared/records) of a signed version (?version=N, default the newest): the
 * record, its hash, the signatures and the public keys they use. verifyBundle checks it offline.
 * A bundle is the record leaving the system, so it follows the export rule (exportableRecord:
 * 404 unreadable, 403 readable but not one's own) and is audited like export.json.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const { version } = await validQuery(event, versionQuerySchema)
  return sendRecordBundle(event, person, id, version, false)
})
