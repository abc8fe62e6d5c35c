import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** A signed record as PDF/A-3b (bundle attached) for a host system. */
export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:export')
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  return sendRecordPdf(event, person, id, version)
})
