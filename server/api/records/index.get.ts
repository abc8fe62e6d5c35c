import { recordSearchSchema } from '#shared/schemas/records'

/**
 * The records workspace: signed entry versions, filtered, sorted and paged on the server. Every
 * search by a records officer or an administrator is audited (`records_searched`) with its
 * filters and how many records matched: who looked for what is part of the trail (issue 15).
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'compliance', 'admin')
  const query = validQuery(event, recordSearchSchema)
  const { page, pageSize, sort, direction, ...filters } = query
  const { rows, total } = await searchRecords(filters, { offset: (page - 1) * pageSize, limit: pageSize, sort, direction })
  await recordAudit(useDatabase(), {
    action: 'records_searched', actorId: person.id, actorEmail: person.email, subjectType: 'records', subjectId: null,
    details: { filters: Object.fromEntries(Object.entries(filters).filter(([, value]) => value !== undefined && value !== '')), page, matched: total },
  })
  return { records: rows, total, page, pageSize, facets: await recordFacets() }
})
