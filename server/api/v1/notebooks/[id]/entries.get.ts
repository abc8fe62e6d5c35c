import { and, asc, count, desc, eq, ilike, type SQL } from 'drizzle-orm'
import { z } from 'zod'
import { entryListQuerySchema } from '#shared/schemas/entries'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries, people } from '../../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:read')
  const { id } = await validParams(event, paramsSchema)
  const query = await validQuery(event, entryListQuerySchema)
  await readableNotebook(person, id)
  const conditions: SQL[] = [eq(entries.notebookId, id)]
  if (query.q) conditions.push(ilike(entries.title, `%${query.q.replace(/[\\%_]/g, c => `\\${c}`)}%`))
  if (query.state) conditions.push(eq(entryStateSql(), query.state))
  if (query.author) conditions.push(eq(entries.authorId, query.author))
  const where = and(...conditions)
  const sortColumn = { title: entries.title, updatedAt: entries.updatedAt, createdAt: entries.createdAt, state: entryStateSql(), author: people.name }[query.sort]
  const database = useDatabase()
  const rows = await database.select({
    id: entries.id, title: entries.title, state: entryStateSql(), version: entries.version,
    createdAt: entries.createdAt, updatedAt: entries.updatedAt, author: { id: people.id, name: people.name },
  }).from(entries).innerJoin(people, eq(people.id, entries.authorId)).where(where)
    .orderBy(query.direction === 'asc' ? asc(sortColumn) : desc(sortColumn), desc(entries.id))
    .limit(query.pageSize).offset((query.page - 1) * query.pageSize)
  const [{ total } = { total: 0 }] = await database.select({ total: count() }).from(entries).where(where)
  return { entries: rows, total, page: query.page, pageSize: query.pageSize }
})
