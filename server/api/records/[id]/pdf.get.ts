import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** The signed record as PDF/A-3b with its bundle attached; the newest signed version unless ?version=N. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  const record = await exportableRecord(person, id, version)
  const pdf = await renderRecordPdf(record)
  await recordAudit(useDatabase(), {
    action: 'record_exported', actorId: person.id, actorEmail: person.email,
    subjectType: 'entry', subjectId: record.entry.id, details: { version: record.version, format: 'pdf', recordHash: record.bundle.recordHash },
  })
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `attachment; filename="${recordFileStem(record)}.pdf"`,
    'cache-control': 'private, no-store',
  })
  return pdf
})
