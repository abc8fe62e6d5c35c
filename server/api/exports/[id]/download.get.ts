import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The finished export as a zip, streamed from storage (PDFs, bundle JSONs, manifest.json).
 * 410 once its files were removed after the retention period (expireExportFiles).
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const job = await visibleExportJob(person, id)
  if (job.status !== 'done')
    throw createError({ statusCode: 409, message: `This export is ${job.status}${job.status === 'running' ? ` (${job.done} of ${job.total})` : ''}; it can be downloaded when done.` })
  if (job.storageKey === null)
    throw createError({ statusCode: 410, message: `The files of this export were removed after ${retentionDaysText(exportRetentionDays())}; run the export again.` })
  const archive = await exportZipStream(job)
  await recordAudit(useDatabase(), { action: 'export_downloaded', actorId: person.id, actorEmail: person.email, subjectType: 'export', subjectId: id, details: { records: job.total } })
  setResponseHeaders(event, {
    'content-type': 'application/zip',
    'content-disposition': `attachment; filename="thermotome-export-${id}.zip"`,
    'cache-control': 'private, no-store',
  })
  return sendStream(event, archive)
})
