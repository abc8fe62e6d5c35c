import { asc, count, eq, inArray } from 'drizzle-orm'
import { entries, notebookMembers, notebooks } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const database = useDatabase()
  const base = database.select({
    id: notebooks.id, name: notebooks.name, description: notebooks.description, createdAt: notebooks.createdAt,
  }).from(notebooks)
  const rows = readsAllNotebooks(person)
    ? await base.orderBy(asc(notebooks.name))
    : await base.where(inArray(notebooks.id,
        database.select({ id: notebookMembers.notebookId }).from(notebookMembers).where(eq(notebookMembers.personId, person.id)),
      )).orderBy(asc(notebooks.name))
  const ids = rows.map(r => r.id)
  const counts = ids.length
    ? await database.select({ notebookId: entries.notebookId, entries: count() }).from(entries)
        .where(inArray(entries.notebookId, ids)).groupBy(entries.notebookId)
    : []
  const members = ids.length
    ? await database.select({ notebookId: notebookMembers.notebookId, members: count() }).from(notebookMembers)
        .where(inArray(notebookMembers.notebookId, ids)).groupBy(notebookMembers.notebookId)
    : []
  return {
    notebooks: rows.map(row => ({
      ...row,
      entryCount: counts.find(c => c.notebookId === row.id)?.entries ?? 0,
      memberCount: members.find(c => c.notebookId === row.id)?.members ?? 0,
    })),
  }
})
