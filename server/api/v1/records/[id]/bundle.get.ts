import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** A signed record's bundle for a host system; the same bytes the PDF carries inside. */
export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:export')
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  return sendRecordBundle(event, person, id, version, false)
})
