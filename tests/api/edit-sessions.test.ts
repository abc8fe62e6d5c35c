// Issue 15: autosaves are one "edited" audit event per editing session (a gap of more than five
// minutes starts a new one) carrying the number of saves and the first and last content hash;
// the audit rows are only ever appended. Reading a record (PDF, bundle, verification) and a
// records search are each one event.
import { createHash } from 'node:crypto'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { canonicalJson } from '../../shared/records'
import { as, demoPerson, type Client } from '../support/http'
import { createSignedRecord } from '../support/signedRecords'
import { uploadFile } from '../support/upload'

let database: pg.Client
let amara: Client
let felix: Client
let notebookId: string

const doc = (text: string) => ({ type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text }] }] })
// The hash the server states: SHA-256 of the RFC 8785 canonical JSON of { title, content }.
const contentHash = (title: string, content: unknown) => createHash('sha256').update(canonicalJson({ title, content } as never), 'utf8').digest('hex')

async function eventsOf(entryId: string) {
  const { rows } = await database.query(`SELECT sequence, action, actor_email, details FROM audit_events WHERE subject_type = 'entry' AND subject_id = $1 ORDER BY sequence`, [entryId])
  return rows as { sequence: string, action: string, actor_email: string, details: Record<string, any> }[]
}

async function newDraft(title: string): Promise<{ id: string, lockVersion: number }> {
  const reply = await amara.post(`/api/notebooks/${notebookId}/entries`, { title })
  expect(reply.status).toBe(201)
  return { id: reply.body.entry.id, lockVersion: reply.body.entry.lockVersion }
}

/** `count` autosaves in a row, as the editor sends them; returns the last lock version and content. */
async function autosave(entry: { id: string, lockVersion: number }, count: number, label: string) {
  let lockVersion = entry.lockVersion
  let content = doc('')
  for (let save = 1; save <= count; save++) {
    content = doc(`${label} ${save}`)
    const reply = await amara.patch(`/api/entries/${entry.id}`, { lockVersion, content })
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    lockVersion = reply.body.entry.lockVersion
  }
  entry.lockVersion = lockVersion
  return content
}

beforeAll(async () => {
  database = new pg.Client({ connectionString: inject('databaseURL') })
  await database.connect()
  ;[amara, felix] = await Promise.all([as('amara'), as('felix')])
  const notebooks = (await amara.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
  notebookId = notebooks.find(n => n.name.startsWith('Infrared'))!.id
}, 60_000)
afterAll(async () => { await database?.end() })

describe('autosaves in the audit trail', () => {
  it('leaves one "edited" event for 200 saves in one sitting, with the count and the first and last content hash', async () => {
    const title = `Two hundred saves ${Date.now()}`
    const entry = await newDraft(title)
    const before = (await database.query('SELECT count(*)::int AS n FROM audit_events')).rows[0].n
    const first = doc('sitting 1')
    const last = await autosave(entry, 200, 'sitting')
    // While the sitting lasts, nothing is appended per save.
    expect((await eventsOf(entry.id)).filter(event => event.action === 'entry_edited')).toEqual([])
    expect((await database.query('SELECT count(*)::int AS n FROM audit_events')).rows[0].n).toBe(before)

    // A save more than five minutes after the last one starts a new session and closes this one.
    await database.query(`UPDATE entry_edit_sessions SET started_at = started_at - interval '6 minutes', last_saved_at = last_saved_at - interval '6 minutes' WHERE entry_id = $1`, [entry.id])
    await autosave(entry, 1, 'after the break')
    const edited = (await eventsOf(entry.id)).filter(event => event.action === 'entry_edited')
    expect(edited).toHaveLength(1)
    expect(edited[0]!.actor_email).toBe(demoPerson('amara').email)
    expect(edited[0]!.details).toMatchObject({
      saves: 200, version: 1, closedBy: 'next_session', titleChanged: false,
      firstContentHash: contentHash(title, first), lastContentHash: contentHash(title, last),
    })
    expect(edited[0]!.details.toLockVersion - edited[0]!.details.fromLockVersion).toBe(199)
    expect(Date.parse(edited[0]!.details.lastSavedAt)).toBeGreaterThanOrEqual(Date.parse(edited[0]!.details.firstSavedAt))

    // The open session is in the entry's history, not yet in the audit trail.
    const history = (await amara.get(`/api/entries/${entry.id}/audit`)).body
    expect(history.openSession).toMatchObject({ saves: 1 })
    expect((await felix.get('/api/audit/verify')).body.ok).toBe(true)
  }, 120_000)

  it('closes the session before any other event about the entry, so the trail reads in order', async () => {
    const entry = await newDraft(`Saved then a file ${Date.now()}`)
    await autosave(entry, 3, 'draft')
    const upload = await uploadFile(amara, `/api/entries/${entry.id}/attachments`, 'levels.csv', 'energy_cm-1,degeneracy\n0,1\n', 'text/csv')
    expect(upload.status).toBe(201)
    const actions = (await eventsOf(entry.id)).map(event => [event.action, event.details.saves ?? null])
    expect(actions).toEqual([['entry_created', null], ['entry_edited', 3], ['attachment_added', null]])
    expect((await amara.get(`/api/entries/${entry.id}/audit`)).body.openSession).toBeNull()
  })

  it('never updates an audit row: the table still refuses UPDATE', async () => {
    expect((await database.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'entry_edited'`)).rows[0].n).toBeGreaterThan(0)
    await expect(database.query(`UPDATE audit_events SET details = '{}' WHERE action = 'entry_edited'`)).rejects.toThrow(/append-only: UPDATE refused/)
  })
})

describe('reading records leaves a trace', () => {
  it('audits a PDF download, a bundle download and a verification once each, and a records search with its filters', async () => {
    const record = await createSignedRecord(inject('databaseURL'), { authorEmail: demoPerson('amara').email, notebook: 'Infrared', title: `Read trace ${Date.now()}` }, database)
    const headers = { cookie: felix.cookie, 'x-forwarded-for': felix.address }
    expect((await fetch(`${inject('baseURL')}/api/records/${record.entryId}/pdf`, { headers })).status).toBe(200)
    expect((await felix.get(`/api/records/${record.entryId}/bundle`)).status).toBe(200)
    const verified = await felix.get(`/api/records/${record.entryId}/verify`)
    expect(verified.status).toBe(200)
    const reads = (await eventsOf(record.entryId)).filter(event => event.action.startsWith('record_'))
    expect(reads.map(event => event.action)).toEqual(['record_exported', 'record_bundle_downloaded', 'record_verified'])
    expect(reads.every(event => event.actor_email === demoPerson('felix').email)).toBe(true)
    expect(reads[2]!.details).toMatchObject({ outcome: 'verified', recordHash: record.bundle.recordHash })

    const search = await felix.get(`/api/records?q=${encodeURIComponent('Read trace')}&state=awaiting_witness`)
    expect(search.status).toBe(200)
    const { rows: [searched] } = await database.query(`SELECT actor_email, details FROM audit_events WHERE action = 'records_searched' ORDER BY sequence DESC LIMIT 1`)
    expect(searched.actor_email).toBe(demoPerson('felix').email)
    expect(searched.details).toMatchObject({ filters: { q: 'Read trace', state: 'awaiting_witness' }, page: 1, matched: search.body.total })
  }, 60_000)
})
