import { asc, eq, inArray } from 'drizzle-orm'
import { notebookMembers, notebooks } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:read')
  const database = useDatabase()
  const base = database.select({ id: notebooks.id, name: notebooks.name, description: notebooks.description }).from(notebooks)
  const rows = readsAllNotebooks(person)
    ? await base.orderBy(asc(notebooks.name))
    : await base.where(inArray(notebooks.id, database.select({ id: notebookMembers.notebookId }).from(notebookMembers).where(eq(notebookMembers.personId, person.id)))).orderBy(asc(notebooks.name))
  return { notebooks: rows }
})
