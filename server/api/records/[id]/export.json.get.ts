import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** The record bundle as a JSON download (the same bytes the PDF carries inside). */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  return sendRecordBundle(event, person, id, version)
})
