import { z } from 'zod'
import { canonicalJson } from '#shared/records'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** The record bundle as a JSON download (the same bytes the PDF carries inside). */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  const record = await exportableRecord(person, id, version)
  await recordAudit(useDatabase(), {
    action: 'record_bundle_downloaded', actorId: person.id, actorEmail: person.email,
    subjectType: 'entry', subjectId: record.entry.id, details: { version: record.version, format: 'json', recordHash: record.bundle.recordHash },
  })
  setResponseHeaders(event, {
    'content-type': 'application/json; charset=utf-8',
    'content-disposition': `attachment; filename="${recordFileStem(record)}.json"`,
    'cache-control': 'private, no-store',
  })
  return canonicalJson(record.bundle as never)
})
