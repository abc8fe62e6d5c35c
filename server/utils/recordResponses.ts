import type { H3Event } from 'h3'
import { canonicalJson } from '#shared/records'
import type { SessionPerson } from './auth'
import type { ExportRecord } from './recordBundle'

interface Requester extends SessionPerson {
  /** Set when the request came with an integration API token. */
  tokenId?: string
}

/** Audit a record leaving the system, by session or by API token. */
async function auditRecordExport(person: Requester, record: ExportRecord, action: 'record_exported' | 'record_bundle_downloaded', format: 'pdf' | 'json') {
  await recordAudit(useDatabase(), {
    action, actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: record.entry.id,
    details: { title: record.entry.title, version: record.version, format, recordHash: record.bundle.recordHash, ...(person.tokenId ? { via: 'api', tokenId: person.tokenId } : {}) },
  })
}

/** The signed record as PDF/A-3b with its bundle attached, as a download. */
export async function sendRecordPdf(event: H3Event, person: Requester, entryId: string, version?: number) {
  const record = await exportableRecord(person, entryId, version)
  const pdf = await renderRecordPdf(record)
  await auditRecordExport(person, record, 'record_exported', 'pdf')
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `attachment; filename="${recordFileStem(record)}.pdf"`,
    'cache-control': 'private, no-store',
  })
  return pdf
}

/** The record bundle as canonical JSON (the same bytes the PDF carries inside). */
export async function sendRecordBundle(event: H3Event, person: Requester, entryId: string, version?: number, asDownload = true) {
  const record = await exportableRecord(person, entryId, version)
  await auditRecordExport(person, record, 'record_bundle_downloaded', 'json')
  setResponseHeaders(event, {
    'content-type': 'application/json; charset=utf-8',
    ...(asDownload ? { 'content-disposition': `attachment; filename="${recordFileStem(record)}.json"` } : {}),
    'cache-control': 'private, no-store',
  })
  return canonicalJson(record.bundle as never)
}
