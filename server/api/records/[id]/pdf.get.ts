import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** The signed record as PDF/A-3b with its bundle attached; the newest signed version unless ?version=N. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  return sendRecordPdf(event, person, id, version)
})
