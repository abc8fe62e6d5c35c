import { and, count, desc, eq, gte, lte, type SQL } from 'drizzle-orm'
import { z } from 'zod'
import { auditEvents } from '../../database/schema'

const querySchema = z.object({
  page: z.coerce.number({ error: 'expected a page number' }).int().min(1, 'pages start at 1').max(1_000_000).default(1),
  pageSize: z.coerce.number({ error: 'expected a page size' }).int().min(1).max(200, 'at most 200').default(50),
  action: z.string().trim().max(60).optional(),
  actorId: z.uuid({ error: 'expected a person id (UUID)' }).optional(),
  subjectId: z.string().trim().max(100).optional(),
  from: z.iso.datetime({ error: 'expected an ISO 8601 date and time such as 2026-01-31T00:00:00Z', offset: true }).optional(),
  to: z.iso.datetime({ error: 'expected an ISO 8601 date and time such as 2026-01-31T23:59:59Z', offset: true }).optional(),
})

export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance', 'admin')
  const query = await validQuery(event, querySchema)
  const conditions: SQL[] = []
  if (query.action) conditions.push(eq(auditEvents.action, query.action))
  if (query.actorId) conditions.push(eq(auditEvents.actorId, query.actorId))
  if (query.subjectId) conditions.push(eq(auditEvents.subjectId, query.subjectId))
  if (query.from) conditions.push(gte(auditEvents.occurredAt, new Date(query.from)))
  if (query.to) conditions.push(lte(auditEvents.occurredAt, new Date(query.to)))
  const where = conditions.length ? and(...conditions) : undefined
  const database = useDatabase()
  const events = await database.select().from(auditEvents).where(where)
    .orderBy(desc(auditEvents.sequence)).limit(query.pageSize).offset((query.page - 1) * query.pageSize)
  const [{ total } = { total: 0 }] = await database.select({ total: count() }).from(auditEvents).where(where)
  return { events, total, page: query.page, pageSize: query.pageSize }
})
