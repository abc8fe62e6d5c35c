import { count, desc } from 'drizzle-orm'
import { z } from 'zod'
import { auditFiltersSchema } from '#shared/schemas/audit'
import { auditEvents } from '../../database/schema'

const querySchema = auditFiltersSchema.extend({
  page: z.coerce.number({ error: 'expected a page number' }).int().min(1, 'pages start at 1').max(1_000_000).default(1),
  pageSize: z.coerce.number({ error: 'expected a page size' }).int().min(1).max(200, 'at most 200').default(50),
})

export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance', 'admin')
  const query = await validQuery(event, querySchema)
  const where = auditFilterCondition(query)
  const database = useDatabase()
  // Names beside the ids: people read names and titles, the ids stay for hover and the CSV.
  const events = await database.select({
    sequence: auditEvents.sequence, occurredAt: auditEvents.occurredAt, action: auditEvents.action,
    actorId: auditEvents.actorId, actorEmail: auditEvents.actorEmail, subjectType: auditEvents.subjectType, subjectId: auditEvents.subjectId,
    details: auditEvents.details, hash: auditEvents.hash, ...auditReadableColumns,
  }).from(auditEvents).where(where)
    .orderBy(desc(auditEvents.sequence)).limit(query.pageSize).offset((query.page - 1) * query.pageSize)
  const [{ total } = { total: 0 }] = await database.select({ total: count() }).from(auditEvents).where(where)
  return { events, total, page: query.page, pageSize: query.pageSize }
})
