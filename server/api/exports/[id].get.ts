import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })

/** Progress of one bulk export (done of total) and whether it can be downloaded. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  return { job: exportJobView(await visibleExportJob(person, id)) }
})
