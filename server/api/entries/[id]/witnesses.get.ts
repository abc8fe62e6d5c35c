import { and, eq, ne } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { notebookMembers, people, personRoles } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** Who may witness this entry: members of its notebook with the witness role, other than the author. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const entry = await readableEntry(person, id)
  const witnesses = await useDatabase().select({ id: people.id, name: people.name, email: people.email }).from(people)
    .innerJoin(notebookMembers, and(eq(notebookMembers.personId, people.id), eq(notebookMembers.notebookId, entry.notebookId)))
    .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.role, 'witness')))
    .where(and(ne(people.id, entry.authorId), eq(people.disabled, false))).orderBy(people.name)
  return { witnesses }
})
