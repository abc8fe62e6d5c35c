import { recordSearchSchema } from '#shared/schemas/records'

/** The records workspace: signed entry versions, filtered, sorted and paged on the server. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance', 'admin')
  const query = validQuery(event, recordSearchSchema)
  const { page, pageSize, sort, direction, ...filters } = query
  const { rows, total } = await searchRecords(filters, { offset: (page - 1) * pageSize, limit: pageSize, sort, direction })
  return { records: rows, total, page, pageSize, facets: await recordFacets() }
})
