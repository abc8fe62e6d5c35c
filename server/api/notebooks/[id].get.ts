import { asc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { notebookMembers, people, personRoles } from '../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const notebook = await readableNotebook(person, id)
  const database = useDatabase()
  const members = await database.select({ id: people.id, name: people.name, email: people.email, disabled: people.disabled })
    .from(notebookMembers).innerJoin(people, eq(people.id, notebookMembers.personId))
    .where(eq(notebookMembers.notebookId, id)).orderBy(asc(people.name))
  const roles = members.length ? await database.select().from(personRoles) : []
  return {
    notebook,
    members: members.map(m => ({ ...m, roles: roles.filter(r => r.personId === m.id).map(r => r.role).sort() })),
    canWrite: person.roles.includes('scientist') && members.some(m => m.id === person.id),
  }
})
