import { and, eq, getTableColumns } from 'drizzle-orm'
import { entries, notebookMembers, notebooks } from '../database/schema'
import type { SessionPerson } from './auth'
import { entryStateSql, type EntryWithState } from './lifecycle'

export async function isMember(notebookId: string, personId: string): Promise<boolean> {
  const [row] = await useDatabase().select({ personId: notebookMembers.personId }).from(notebookMembers)
    .where(and(eq(notebookMembers.notebookId, notebookId), eq(notebookMembers.personId, personId))).limit(1)
  return Boolean(row)
}

/** The notebook if this person may read it; "missing or not yours" is the same 404. */
export async function readableNotebook(person: SessionPerson, notebookId: string) {
  const [notebook] = await useDatabase().select().from(notebooks).where(eq(notebooks.id, notebookId)).limit(1)
  if (!notebook || (!readsAllNotebooks(person) && !(await isMember(notebookId, person.id))))
    throw createError({ statusCode: 404, message: 'No such notebook, or it is not shared with you.' })
  return notebook
}

/**
 * The entry if this person may read it (member of its notebook, or compliance/admin), with its
 * state derived from the frozen tables (server/utils/lifecycle.ts).
 */
export async function readableEntry(person: SessionPerson, entryId: string): Promise<EntryWithState> {
  const [entry] = await useDatabase().select({ ...getTableColumns(entries), state: entryStateSql() }).from(entries).where(eq(entries.id, entryId)).limit(1)
  if (!entry || (!readsAllNotebooks(person) && !(await isMember(entry.notebookId, person.id))))
    throw createError({ statusCode: 404, message: 'No such entry, or it is not shared with you.' })
  return entry
}
