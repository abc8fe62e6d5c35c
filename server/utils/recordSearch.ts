import { sql, type SQL } from 'drizzle-orm'
import type { RecordFilters } from '#shared/schemas/records'

/** One row of the records workspace: a signed entry version with its people. */
export interface RecordRow {
  entryId: string
  versionId: string
  version: number
  title: string
  notebookId: string
  notebookName: string
  authorId: string
  authorName: string
  witnessId: string | null
  witnessName: string | null
  state: string
  signedAt: string
  recordHash: string
}

// State of a version: the entry's (derived) state for its newest version; an older one was superseded.
const versionState = versionStatusSql(sql`ev.version`, sql`e.id`, sql`e.version`)

const FROM = sql`
  FROM entry_versions ev
  JOIN entries e ON e.id = ev.entry_id
  JOIN notebooks n ON n.id = e.notebook_id
  JOIN people a ON a.id = e.author_id
  LEFT JOIN LATERAL (
    SELECT s.signer_id, p.name FROM signatures s JOIN people p ON p.id = s.signer_id
    WHERE s.entry_version_id = ev.id AND s.meaning = 'witnessed' LIMIT 1
  ) w ON true`

function whereClause(filters: RecordFilters): SQL {
  const conditions: SQL[] = [sql`true`]
  if (filters.notebookId) conditions.push(sql`e.notebook_id = ${filters.notebookId}`)
  if (filters.authorId) conditions.push(sql`e.author_id = ${filters.authorId}`)
  if (filters.witnessId) conditions.push(sql`w.signer_id = ${filters.witnessId}`)
  if (filters.state) conditions.push(sql`${versionState} = ${filters.state}`)
  if (filters.from) conditions.push(sql`ev.frozen_at >= ${new Date(filters.from)}`)
  if (filters.to) conditions.push(sql`ev.frozen_at <= ${new Date(filters.to)}`)
  if (filters.q) conditions.push(sql`ev.title ILIKE ${`%${filters.q.replace(/[\\%_]/g, match => `\\${match}`)}%`}`)
  return sql.join(conditions, sql` AND `)
}

const ORDER: Record<string, SQL> = {
  signedAt: sql`ev.frozen_at`, title: sql`lower(ev.title)`, notebook: sql`lower(n.name)`,
  author: sql`lower(a.name)`, state: sql`${versionState}`, version: sql`ev.version`,
}

/** A page of signed records, with the total that match. */
export async function searchRecords(filters: RecordFilters, page: { offset: number, limit: number, sort: string, direction: 'asc' | 'desc' }): Promise<{ rows: RecordRow[], total: number }> {
  const database = useDatabase()
  const order = ORDER[page.sort] ?? ORDER.signedAt!
  const direction = page.direction === 'asc' ? sql`ASC` : sql`DESC`
  const where = whereClause(filters)
  const result = await database.execute(sql`
    SELECT ev.entry_id AS "entryId", ev.id AS "versionId", ev.version, ev.title, n.id AS "notebookId", n.name AS "notebookName",
      a.id AS "authorId", a.name AS "authorName", w.signer_id AS "witnessId", w.name AS "witnessName",
      ${versionState} AS state, ev.frozen_at AS "signedAt", ev.record_hash AS "recordHash"
    ${FROM} WHERE ${where}
    ORDER BY ${order} ${direction}, ev.id ${direction}
    LIMIT ${page.limit} OFFSET ${page.offset}`)
  const [count] = (await database.execute(sql`SELECT count(*)::int AS total ${FROM} WHERE ${where}`)).rows as { total: number }[]
  return {
    rows: (result.rows as unknown as RecordRow[]).map(row => ({ ...row, signedAt: new Date(row.signedAt).toISOString() })),
    total: count?.total ?? 0,
  }
}

/** Every (entry, version) the filters select, oldest first, up to `limit`. */
export async function recordKeysMatching(filters: RecordFilters, limit: number): Promise<{ entryId: string, version: number }[]> {
  const result = await useDatabase().execute(sql`
    SELECT ev.entry_id AS "entryId", ev.version ${FROM} WHERE ${whereClause(filters)}
    ORDER BY ev.frozen_at ASC, ev.id ASC LIMIT ${limit}`)
  return result.rows as { entryId: string, version: number }[]
}

/** Notebooks, authors and witnesses that occur among signed records, for the filter menus. */
export async function recordFacets() {
  const database = useDatabase()
  const notebooks = await database.execute(sql`SELECT DISTINCT n.id, n.name FROM entry_versions ev JOIN entries e ON e.id = ev.entry_id JOIN notebooks n ON n.id = e.notebook_id ORDER BY n.name`)
  const authors = await database.execute(sql`SELECT DISTINCT a.id, a.name FROM entry_versions ev JOIN entries e ON e.id = ev.entry_id JOIN people a ON a.id = e.author_id ORDER BY a.name`)
  const witnesses = await database.execute(sql`SELECT DISTINCT p.id, p.name FROM signatures s JOIN people p ON p.id = s.signer_id WHERE s.meaning = 'witnessed' ORDER BY p.name`)
  return { notebooks: notebooks.rows as { id: string, name: string }[], authors: authors.rows as { id: string, name: string }[], witnesses: witnesses.rows as { id: string, name: string }[] }
}
