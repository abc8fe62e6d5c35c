import { sql, type SQL, type SQLWrapper } from 'drizzle-orm'
import { entryStateOf, mayDo, versionStatusOf } from '#shared/records/lifecycle'
import type { EntryState, LifecycleAction, LifecycleEntry, VersionFacts, VersionStatus } from '#shared/records/lifecycle'
import { entries, type Entry } from '../database/schema'
import type { SessionPerson } from './auth'

// The database side of shared/records/lifecycle.ts: the facts a state is derived from, read
// from the frozen tables, and the same rule as one SQL expression for lists, filters and sorts.
// tests/api/lifecycle.test.ts checks that the SQL and entryStateOf agree for every case.

/** An entry row with its derived state. */
export type EntryWithState = Entry & { state: EntryState }

/**
 * The facts about version `version` of entry `entryId` as three SQL booleans, in the order of
 * VersionFacts. Takes columns or SQL for the entry id and version (a table's columns, or an
 * alias such as sql`e.id`).
 */
function factsSql(entryId: SQLWrapper, version: SQLWrapper) {
  const frozen = sql`EXISTS (SELECT 1 FROM entry_versions fv WHERE fv.entry_id = ${entryId} AND fv.version = ${version})`
  const countersigned = sql`EXISTS (SELECT 1 FROM entry_versions fv JOIN signatures fs ON fs.entry_version_id = fv.id
    WHERE fv.entry_id = ${entryId} AND fv.version = ${version} AND fs.meaning = 'witnessed')`
  const declined = sql`EXISTS (SELECT 1 FROM witness_requests fw
    WHERE fw.entry_id = ${entryId} AND fw.version = ${version} AND fw.outcome = 'declined')`
  return { frozen, countersigned, declined }
}

/** entryStateOf as SQL: the state of the entry's current version, derived, never stored. */
export function entryStateSql(entryId: SQLWrapper = entries.id, version: SQLWrapper = entries.version): SQL<EntryState> {
  const facts = factsSql(entryId, version)
  return sql<EntryState>`(CASE WHEN NOT ${facts.frozen} THEN 'draft' WHEN ${facts.countersigned} THEN 'witnessed'
    WHEN ${facts.declined} THEN 'declined' ELSE 'awaiting_witness' END)`
}

/** versionStatusOf as SQL for a frozen version `versionNumber` of an entry whose current version is `currentVersion`. */
export function versionStatusSql(versionNumber: SQLWrapper, entryId: SQLWrapper, currentVersion: SQLWrapper): SQL<VersionStatus> {
  return sql<VersionStatus>`(CASE WHEN ${versionNumber} < ${currentVersion} THEN 'superseded' ELSE ${entryStateSql(entryId, currentVersion)} END)`
}

type Reader = Pick<ReturnType<typeof useDatabase>, 'execute'>

/** The facts of the entry's current version, read now (inside a transaction when given one). */
export async function lifecycleFacts(database: Reader, entry: Pick<Entry, 'id' | 'version'>): Promise<VersionFacts> {
  const facts = factsSql(sql`${entry.id}::uuid`, sql`${entry.version}::integer`)
  const result = await database.execute(sql`SELECT ${facts.frozen} AS frozen, ${facts.countersigned} AS countersigned, ${facts.declined} AS declined`)
  const row = result.rows[0] as { frozen: boolean, countersigned: boolean, declined: boolean }
  return { frozen: row.frozen, countersigned: row.countersigned, declined: row.declined }
}

/** The entry row with its state derived from the facts. */
export async function lifecycleWithState(database: Reader, entry: Entry): Promise<EntryWithState> {
  return { ...entry, state: entryStateOf(await lifecycleFacts(database, entry)) }
}

/** The status of one version of an entry (superseded for an older one). */
export function lifecycleVersionStatus(version: number, entry: EntryWithState): VersionStatus {
  return versionStatusOf(version, entry)
}

/** What mayDo needs about this person and entry, read from the database. */
export async function lifecycleEntryFor(person: SessionPerson, entry: EntryWithState): Promise<LifecycleEntry> {
  const database = useDatabase()
  const [personIsMember, openRequest] = await Promise.all([
    isMember(entry.notebookId, person.id),
    entry.state === 'awaiting_witness' ? signingOpenRequestFor(database, entry.id, entry.version, person.id) : Promise.resolve(undefined),
  ])
  return { authorId: entry.authorId, state: entry.state, personIsMember, personAskedToWitness: Boolean(openRequest) }
}

/** Throws the status and reason mayDo gives when `person` may not take `action` on `entry` now. */
export function lifecycleRequire(action: LifecycleAction, person: SessionPerson, entry: LifecycleEntry): void {
  const permission = mayDo(action, person, entry)
  if (!permission.allowed)
    throw createError({ statusCode: permission.status, message: permission.reason })
}

/** Reads the entry (404 when not readable) and checks `action` is open to the person: the first step of every signing route. */
export async function lifecycleAllowed(person: SessionPerson, entryId: string, action: LifecycleAction): Promise<EntryWithState> {
  const entry = await readableEntry(person, entryId)
  lifecycleRequire(action, person, await lifecycleEntryFor(person, entry))
  return entry
}

/** The author may change the entry (text, blocks, files) only while it is a draft: mayDo's 'edit'. */
export function lifecycleRequireEditor(person: SessionPerson, entry: Pick<EntryWithState, 'authorId' | 'state'>): void {
  lifecycleRequire('edit', person, { authorId: entry.authorId, state: entry.state, personIsMember: true, personAskedToWitness: false })
}
