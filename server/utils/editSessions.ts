import { createHash } from 'node:crypto'
import { eq, lt, sql } from 'drizzle-orm'
import { canonicalJson } from '#shared/records'
import { entryEditSessions } from '../database/schema'
import { closeEditSession } from './audit'
import type { Database } from './db'

/** A save more than this long after the one before starts a new editing session (issue 15). */
export const EDIT_SESSION_GAP_MINUTES = 5

type Transaction = Parameters<Parameters<Database['transaction']>[0]>[0]

/** SHA-256 of the canonical JSON of what a save left: the title and the document. */
export function entryContentHash(title: string, content: unknown): string {
  let text: string
  try { text = canonicalJson({ title, content } as never) }
  catch { text = JSON.stringify({ title, content }) }
  return createHash('sha256').update(text, 'utf8').digest('hex')
}

export interface EntrySave {
  entryId: string
  personId: string
  personEmail: string
  version: number
  lockVersion: number
  contentHash: string
  titleChanged: boolean
}

/**
 * Counts one autosave in the entry's open editing session, inside the save's transaction (the
 * entry row is locked by its UPDATE, so saves of one entry are counted one at a time). A save
 * by someone else, of another version, or more than EDIT_SESSION_GAP_MINUTES after the last one
 * closes the open session (its one audit event) and starts a new one. Times are the database's.
 */
export async function noteEntrySave(tx: Transaction, save: EntrySave): Promise<void> {
  const [open] = await tx.select({
    entryId: entryEditSessions.entryId, startedAt: entryEditSessions.startedAt, personId: entryEditSessions.personId, version: entryEditSessions.version,
    stale: sql<boolean>`${entryEditSessions.lastSavedAt} < now() - make_interval(mins => ${EDIT_SESSION_GAP_MINUTES})`,
  }).from(entryEditSessions).where(eq(entryEditSessions.entryId, save.entryId)).for('update')
  if (open && !open.stale && open.personId === save.personId && open.version === save.version) {
    await tx.update(entryEditSessions).set({
      saves: sql`${entryEditSessions.saves} + 1`, lastSavedAt: sql`now()`, lastLockVersion: save.lockVersion,
      lastContentHash: save.contentHash, titleChanged: sql`${entryEditSessions.titleChanged} OR ${save.titleChanged}`,
    }).where(eq(entryEditSessions.entryId, save.entryId))
    return
  }
  if (open) await closeEditSession(tx, open, 'next_session')
  await tx.insert(entryEditSessions).values({
    entryId: save.entryId, personId: save.personId, personEmail: save.personEmail, version: save.version,
    startedAt: sql`now()`, lastSavedAt: sql`now()`, saves: 1,
    firstLockVersion: save.lockVersion, lastLockVersion: save.lockVersion,
    firstContentHash: save.contentHash, lastContentHash: save.contentHash, titleChanged: save.titleChanged,
  })
}

/** Closes every session idle for longer than the gap (the sweep plugin); returns how many. */
export async function closeIdleEditSessions(database: Database): Promise<number> {
  const idle = await database.select({ entryId: entryEditSessions.entryId, startedAt: entryEditSessions.startedAt }).from(entryEditSessions)
    .where(lt(entryEditSessions.lastSavedAt, sql`now() - make_interval(mins => ${EDIT_SESSION_GAP_MINUTES})`)).limit(500)
  let closed = 0
  for (const session of idle) {
    if (await database.transaction(tx => closeEditSession(tx, session, 'idle', EDIT_SESSION_GAP_MINUTES))) closed++
  }
  return closed
}

/** The entry's open session, for its history (not yet an audit event). */
export async function openEditSession(database: Database, entryId: string) {
  const [open] = await database.select().from(entryEditSessions).where(eq(entryEditSessions.entryId, entryId)).limit(1)
  return open ?? null
}
