import { and, asc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { auditEvents, people } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The entry's own timeline, for everyone who may read the entry: its audit events (with the
 * actor's current name) and the editing session still open, whose saves are not yet an event.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  await readableEntry(person, id)
  const database = useDatabase()
  const events = await database.select({
    sequence: auditEvents.sequence, occurredAt: auditEvents.occurredAt, action: auditEvents.action,
    actorEmail: auditEvents.actorEmail, actorName: people.name, details: auditEvents.details,
  }).from(auditEvents).leftJoin(people, eq(people.id, auditEvents.actorId))
    .where(and(eq(auditEvents.subjectType, 'entry'), eq(auditEvents.subjectId, id)))
    .orderBy(asc(auditEvents.sequence)).limit(500)
  const open = await openEditSession(database, id)
  return {
    events,
    openSession: open ? { personEmail: open.personEmail, version: open.version, saves: open.saves, startedAt: open.startedAt, lastSavedAt: open.lastSavedAt } : null,
  }
})
