import { and, asc, getTableColumns, gt } from 'drizzle-orm'
import { auditFiltersSchema } from '#shared/schemas/audit'
import { auditEvents } from '../../database/schema'

// The stored columns first (integrators read them), then the names people read beside the ids.
const COLUMNS = ['sequence', 'occurredAt', 'action', 'actorEmail', 'actorId', 'subjectType', 'subjectId', 'details', 'previousHash', 'hash', 'actorName', 'subjectName'] as const

/** The filtered audit trail as CSV, oldest first, written in batches (escaped, formula-safe). */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'compliance', 'admin')
  const filters = validQuery(event, auditFiltersSchema)
  const where = auditFilterCondition(filters)
  const database = useDatabase()
  await recordAudit(database, { action: 'audit_exported', actorId: person.id, actorEmail: person.email, subjectType: 'audit', subjectId: null, details: { filters } })
  const lines: string[] = [COLUMNS.join(',')]
  let after = 0
  for (;;) {
    const rows = await database.select({ ...getTableColumns(auditEvents), ...auditReadableColumns }).from(auditEvents).where(and(where, gt(auditEvents.sequence, after))).orderBy(asc(auditEvents.sequence)).limit(5000)
    for (const row of rows) lines.push(COLUMNS.map(column => csvCell(row[column])).join(','))
    if (rows.length < 5000) break
    after = rows[rows.length - 1]!.sequence
  }
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="thermotome-audit-${new Date().toISOString().slice(0, 10)}.csv"`,
    'cache-control': 'private, no-store',
  })
  return `${lines.join('\r\n')}\r\n`
})
