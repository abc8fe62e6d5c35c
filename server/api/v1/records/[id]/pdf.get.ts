import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** A signed record as PDF/A-3b (bundle attached) for a host system. */
export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:export')
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  const record = await exportableRecord(person, id, version)
  const pdf = await renderRecordPdf(record)
  await recordAudit(useDatabase(), {
    action: 'record_exported', actorId: person.id, actorEmail: person.email,
    subjectType: 'entry', subjectId: record.entry.id, details: { version: record.version, format: 'pdf', via: 'api', tokenId: person.tokenId },
  })
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `attachment; filename="${recordFileStem(record)}.pdf"`,
    'cache-control': 'private, no-store',
  })
  return pdf
})
