import { exportRequestSchema } from '#shared/schemas/records'

/** Starts a bulk export (zip of PDFs, bundle JSONs and a manifest) of a selection or of the records a filter selects. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const request = await validBody(event, exportRequestSchema)
  const job = await createExportJob(person, request)
  setResponseStatus(event, 202)
  return { job: exportJobView(job) }
})
