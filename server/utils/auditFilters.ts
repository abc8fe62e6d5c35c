import { and, eq, gte, ilike, lte, sql, type SQL } from 'drizzle-orm'
import type { AuditFilters } from '#shared/schemas/audit'
import { auditEvents } from '../database/schema'

/** The WHERE clause of the audit filters (undefined: everything). */
export function auditFilterCondition(filters: AuditFilters): SQL | undefined {
  const conditions: SQL[] = []
  if (filters.action) conditions.push(eq(auditEvents.action, filters.action))
  if (filters.actorId) conditions.push(eq(auditEvents.actorId, filters.actorId))
  if (filters.person) conditions.push(ilike(auditEvents.actorEmail, `%${filters.person.replace(/[\\%_]/g, match => `\\${match}`)}%`))
  if (filters.subjectType) conditions.push(eq(auditEvents.subjectType, filters.subjectType))
  if (filters.subjectId) conditions.push(eq(auditEvents.subjectId, filters.subjectId))
  if (filters.from) conditions.push(gte(auditEvents.occurredAt, new Date(filters.from)))
  if (filters.to) conditions.push(lte(auditEvents.occurredAt, new Date(filters.to)))
  return conditions.length ? and(...conditions) : undefined
}

/**
 * One CSV cell (RFC 4180): quoted when it holds a comma, quote or line break. A cell starting
 * with = + - @ (or a tab or carriage return) gets a leading apostrophe first, so a spreadsheet
 * shows it as text instead of running it as a formula (OWASP "CSV injection").
 */
export function csvCell(value: unknown): string {
  let text = value === null || value === undefined ? '' : value instanceof Date ? value.toISOString() : typeof value === 'object' ? JSON.stringify(value) : String(value)
  if (/^[=+\-@\t\r]/.test(text)) text = `'${text}`
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text
}

const UUID_PATTERN = '^[0-9a-fA-F]{8}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{12}$'

/**
 * The audit columns people read beside the stored ones: the actor's current name and the
 * subject's (an entry's title, a person's or a notebook's name), looked up by primary key.
 */
export const auditReadableColumns = {
  actorName: sql<string | null>`(SELECT name FROM people WHERE people.id = ${auditEvents.actorId})`,
  subjectName: sql<string | null>`CASE WHEN ${auditEvents.subjectId} ~ ${UUID_PATTERN} THEN CASE ${auditEvents.subjectType}
    WHEN 'entry' THEN (SELECT title FROM entries WHERE entries.id = ${auditEvents.subjectId}::uuid)
    WHEN 'person' THEN (SELECT name FROM people WHERE people.id = ${auditEvents.subjectId}::uuid)
    WHEN 'notebook' THEN (SELECT name FROM notebooks WHERE notebooks.id = ${auditEvents.subjectId}::uuid)
  END END`,
}
