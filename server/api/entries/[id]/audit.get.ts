import { and, asc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { auditEvents } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** The entry's own timeline, for everyone who may read the entry. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  await readableEntry(person, id)
  const events = await useDatabase().select({
    sequence: auditEvents.sequence, occurredAt: auditEvents.occurredAt, action: auditEvents.action,
    actorEmail: auditEvents.actorEmail, details: auditEvents.details,
  }).from(auditEvents).where(and(eq(auditEvents.subjectType, 'entry'), eq(auditEvents.subjectId, id)))
    .orderBy(asc(auditEvents.sequence)).limit(500)
  return { events }
})
