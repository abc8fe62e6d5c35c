import { z } from 'zod'
import { canonicalJson } from '#shared/records'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/records'

const paramsSchema = z.object({ id: uuidSchema })

/** A signed record's bundle for a host system; the same bytes the PDF carries inside. */
export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:export')
  const { id } = validParams(event, paramsSchema)
  const { version } = validQuery(event, versionQuerySchema)
  const record = await exportableRecord(person, id, version)
  await recordAudit(useDatabase(), {
    action: 'record_bundle_downloaded', actorId: person.id, actorEmail: person.email,
    subjectType: 'entry', subjectId: record.entry.id, details: { version: record.version, format: 'json', via: 'api', tokenId: person.tokenId },
  })
  setResponseHeaders(event, { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'private, no-store' })
  return canonicalJson(record.bundle as never)
})
