import { and, desc, eq } from 'drizzle-orm'
import type { RecordBundle } from '#shared/records'
import type { VersionStatus } from '#shared/records/lifecycle'
import { entries, entryVersions, type Entry } from '../database/schema'
import { provenEntryEvents } from './auditAnchor'
import type { PdfAuditEvent } from '../pdf/document'
import type { SessionPerson } from './auth'
import { signingBundleOf } from './recordVerify'

/** Everything a record export needs, read from the frozen tables. */
export interface ExportRecord {
  bundle: RecordBundle
  entry: Entry
  version: number
  /** State of this version: the entry's own state for its newest version, 'superseded' before. */
  state: VersionStatus
  signerIds: string[]
  auditEvents: PdfAuditEvent[]
}

/** Actions that only read a record: left out of its PDF, so that exporting does not change the next export. */
export const READ_ONLY_RECORD_ACTIONS = ['record_exported', 'record_bundle_downloaded', 'record_verified']

/**
 * One signed entry version with what an export needs besides its bundle (the entry, its state,
 * signers and audit events). Null when the entry has no such frozen version.
 */
export async function loadBundleForExport(entryId: string, version?: number): Promise<ExportRecord | null> {
  const database = useDatabase()
  const [row] = await database.select().from(entries).where(eq(entries.id, entryId)).limit(1)
  if (!row) return null
  const entry = await lifecycleWithState(database, row)
  const [frozen] = await database.select().from(entryVersions)
    .where(version === undefined ? eq(entryVersions.entryId, entryId) : and(eq(entryVersions.entryId, entryId), eq(entryVersions.version, version)))
    .orderBy(desc(entryVersions.version)).limit(1)
  if (!frozen) return null
  // The same bundle the signing routes serve (GET /api/records/:id/bundle): one builder, so an
  // export and a bundle download of one version are the same bytes. The export context (state,
  // the entry's audit events with inclusion proofs, the checkpoint anchoring them) makes the
  // PDF a function of the bundle alone, so a verifier can render it again and compare bytes.
  const signed = await signingBundleOf(database, frozen)
  const state = lifecycleVersionStatus(frozen.version, entry)
  const { events, checkpoint } = await provenEntryEvents(database, entryId, READ_ONLY_RECORD_ACTIONS)
  const bundle: RecordBundle = { ...signed, context: { state, auditEvents: events, checkpoint } }
  return {
    bundle,
    entry,
    version: frozen.version,
    state,
    // The signing route stores a signature only when its statement names the person signing.
    signerIds: [...new Set(bundle.signatures.map(signature => signature.statement.signer.id))],
    auditEvents: events,
  }
}

/** May this person export this record? Compliance and admin: all; others: their own (author or signer) in a notebook they belong to. */
export async function mayExportRecord(person: SessionPerson, record: Pick<ExportRecord, 'entry' | 'signerIds'>): Promise<'yes' | 'hidden' | 'forbidden'> {
  if (readsAllNotebooks(person)) return 'yes'
  if (!(await isMember(record.entry.notebookId, person.id))) return 'hidden'
  return record.entry.authorId === person.id || record.signerIds.includes(person.id) ? 'yes' : 'forbidden'
}

/** The record if the person may export it; 404 for missing or unreadable, 403 for readable but not theirs. */
export async function exportableRecord(person: SessionPerson, entryId: string, version?: number): Promise<ExportRecord> {
  const record = await loadBundleForExport(entryId, version)
  const verdict = record ? await mayExportRecord(person, record) : 'hidden'
  if (!record || verdict === 'hidden')
    throw createError({ statusCode: 404, message: version === undefined ? 'No signed record for this entry, or it is not shared with you.' : `No signed version ${version} of this entry, or it is not shared with you.` })
  if (verdict === 'forbidden')
    throw createError({ statusCode: 403, message: 'You may export records you authored or witnessed; others need the compliance role.' })
  return record
}
