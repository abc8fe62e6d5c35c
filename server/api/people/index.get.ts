import { asc } from 'drizzle-orm'
import { people, personRoles } from '../../database/schema'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const database = useDatabase()
  const rows = await database.select({
    id: people.id, email: people.email, name: people.name, disabled: people.disabled, createdAt: people.createdAt,
  }).from(people).orderBy(asc(people.name))
  const roles = await database.select().from(personRoles)
  return {
    people: rows.map(person => ({
      ...person,
      roles: roles.filter(r => r.personId === person.id).map(r => r.role).sort(),
    })),
  }
})
