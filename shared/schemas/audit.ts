import { z } from 'zod'

const isoTime = (example: string) => z.iso.datetime({ error: `expected an ISO 8601 date and time such as ${example}`, offset: true })

/** Filters of the audit trail, shared by the list, the CSV export and the page. */
export const auditFiltersSchema = z.object({
  action: z.string().trim().max(60, 'at most 60 characters').optional(),
  actorId: z.uuid({ error: 'expected a person id (UUID)' }).optional(),
  /** Part of the actor's e-mail address, any case. */
  person: z.string().trim().max(200, 'at most 200 characters').optional(),
  subjectType: z.string().trim().max(40, 'at most 40 characters').optional(),
  subjectId: z.string().trim().max(100, 'at most 100 characters').optional(),
  from: isoTime('2026-01-31T00:00:00Z').optional(),
  to: isoTime('2026-01-31T23:59:59Z').optional(),
})
export type AuditFilters = z.infer<typeof auditFiltersSchema>
