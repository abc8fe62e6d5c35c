import { and, asc, count, desc, eq, ilike, type SQL } from 'drizzle-orm'
import { z } from 'zod'
import { entryListQuerySchema } from '#shared/schemas/entries'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries, people } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

const sortColumns = {
  title: entries.title,
  updatedAt: entries.updatedAt,
  createdAt: entries.createdAt,
  state: entryStateSql(),
  author: people.name,
} as const

/** Escape LIKE wildcards so a search for "50%" means the text "50%". */
function likePattern(text: string) {
  return `%${text.replace(/[\\%_]/g, c => `\\${c}`)}%`
}

export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const query = await validQuery(event, entryListQuerySchema)
  await readableNotebook(person, id)

  const conditions: SQL[] = [eq(entries.notebookId, id)]
  if (query.q) conditions.push(ilike(entries.title, likePattern(query.q)))
  if (query.state) conditions.push(eq(entryStateSql(), query.state))
  if (query.author) conditions.push(eq(entries.authorId, query.author))
  const where = and(...conditions)

  const database = useDatabase()
  const order = query.direction === 'asc' ? asc(sortColumns[query.sort]) : desc(sortColumns[query.sort])
  // The page and the total in parallel: two round trips at once instead of one after the other.
  const [rows, [{ total } = { total: 0 }]] = await Promise.all([database.select({
    id: entries.id, title: entries.title, state: entryStateSql(), version: entries.version,
    createdAt: entries.createdAt, updatedAt: entries.updatedAt,
    author: { id: people.id, name: people.name },
  }).from(entries).innerJoin(people, eq(people.id, entries.authorId))
    .where(where).orderBy(order, desc(entries.id))
    .limit(query.pageSize).offset((query.page - 1) * query.pageSize),
  database.select({ total: count() }).from(entries).where(where)])
  return { entries: rows, total, page: query.page, pageSize: query.pageSize, pages: Math.max(1, Math.ceil(total / query.pageSize)) }
})
