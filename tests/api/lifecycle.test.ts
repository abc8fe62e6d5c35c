import { execFileSync } from 'node:child_process'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { entryStateOf } from '#shared/records/lifecycle'
import { as, demoPerson, type Client } from '../support/http'
import { createSignedRecord, type StoredRecord } from '../support/signedRecords'

// The entry's state is derived from the frozen tables, never stored (shared/records/lifecycle.ts,
// server/utils/lifecycle.ts), and a draft always saves: nothing typed is lost.

let database: pg.Client
let amara: Client
let felix: Client
let notebookId: string
const records = {} as Record<'awaiting' | 'witnessed' | 'declined', StoredRecord>

beforeAll(async () => {
  database = new pg.Client({ connectionString: inject('databaseURL') })
  await database.connect()
  amara = await as('amara')
  felix = await as('felix')
  const author = { authorEmail: demoPerson('amara').email, notebook: 'Infrared' }
  records.awaiting = await createSignedRecord(inject('databaseURL'), { ...author, title: 'Lifecycle: signed, awaiting a witness' }, database)
  records.witnessed = await createSignedRecord(inject('databaseURL'), { ...author, witnessEmail: demoPerson('priya').email, title: 'Lifecycle: witnessed' }, database)
  records.declined = await createSignedRecord(inject('databaseURL'), { ...author, title: 'Lifecycle: declined' }, database)
  notebookId = records.awaiting.notebookId
  const { rows: [priya] } = await database.query('SELECT id FROM people WHERE email = $1', [demoPerson('priya').email])
  await database.query(
    `INSERT INTO witness_requests (entry_id, version, requested_by, witness_id, resolved_at, outcome, reason) VALUES ($1, 1, $2, $3, now(), 'declined', 'The fit ignores the hot band.')`,
    [records.declined.entryId, records.declined.authorId, priya.id],
  )
}, 120_000)
afterAll(async () => { await database?.end() })

describe('the state is derived, never stored', () => {
  it('has no state column to edit: the SQL that used to fake a countersignature fails', async () => {
    await expect(database.query(`UPDATE entries SET state = 'witnessed' WHERE id = $1`, [records.awaiting.entryId])).rejects.toThrow(/column "state" of relation "entries" does not exist/)
  })

  it('shows the same derived state on the entry, in the list, in the records search, in the PDF and in verification', async () => {
    const expected = { awaiting: 'awaiting_witness', witnessed: 'witnessed', declined: 'declined' } as const
    const list = (await amara.get(`/api/notebooks/${notebookId}/entries?pageSize=100&sort=updatedAt`)).body.entries as { id: string, state: string }[]
    for (const [name, record] of Object.entries(records) as [keyof typeof records, StoredRecord][]) {
      expect((await amara.get(`/api/entries/${record.entryId}`)).body.entry.state).toBe(expected[name])
      expect((await amara.get(`/api/entries/${record.entryId}/signing`)).body.entry.state).toBe(expected[name])
      expect(list.find(row => row.id === record.entryId)?.state).toBe(expected[name])
      const found = (await felix.get(`/api/records?q=${encodeURIComponent(record.bundle.record.entry.title)}`)).body
      expect(found.records.map((row: { entryId: string, state: string }) => [row.entryId, row.state])).toContainEqual([record.entryId, expected[name]])
    }
    const filtered = (await amara.get(`/api/notebooks/${notebookId}/entries?state=witnessed&pageSize=100`)).body.entries as { id: string }[]
    expect(filtered.map(row => row.id)).toContain(records.witnessed.entryId)
    expect(filtered.map(row => row.id)).not.toContain(records.awaiting.entryId)

    const pdf = await fetch(`${inject('baseURL')}/api/records/${records.awaiting.entryId}/pdf`, { headers: { cookie: felix.cookie, 'x-forwarded-for': felix.address } })
    expect(pdf.status).toBe(200)
    const text = execFileSync('pdftotext', ['-layout', '-', '-'], { input: Buffer.from(await pdf.arrayBuffer()) }).toString()
    expect(text).toMatch(/Signed — awaiting witness/)
    expect(text).not.toMatch(/Witnessed/)
    const verified = (await felix.get(`/api/records/${records.awaiting.entryId}/verify`)).body
    expect(verified.ok, JSON.stringify(verified.problems)).toBe(true)
    expect(verified.signatures.map((s: { meaning: string }) => s.meaning)).toEqual(['authored'])
  })

  it('derives in SQL exactly what entryStateOf derives from the same rows, for every entry', async () => {
    const { rows } = await database.query(`
      SELECT e.id,
        EXISTS (SELECT 1 FROM entry_versions v WHERE v.entry_id = e.id AND v.version = e.version) AS frozen,
        EXISTS (SELECT 1 FROM entry_versions v JOIN signatures s ON s.entry_version_id = v.id WHERE v.entry_id = e.id AND v.version = e.version AND s.meaning = 'witnessed') AS countersigned,
        EXISTS (SELECT 1 FROM witness_requests w WHERE w.entry_id = e.id AND w.version = e.version AND w.outcome = 'declined') AS declined
      FROM entries e WHERE e.notebook_id = $1`, [notebookId])
    const list = (await amara.get(`/api/notebooks/${notebookId}/entries?pageSize=100`)).body
    expect(list.total).toBe(rows.length)
    const states = new Map((list.entries as { id: string, state: string }[]).map(row => [row.id, row.state]))
    const seen = new Set<string>()
    for (const row of rows) {
      if (!states.has(row.id)) continue
      const derived = entryStateOf({ frozen: row.frozen, countersigned: row.countersigned, declined: row.declined })
      expect(states.get(row.id), row.id).toBe(derived)
      seen.add(derived)
    }
    expect([...seen].sort()).toEqual(['awaiting_witness', 'declined', 'draft', 'witnessed'])
  })
})

describe('a draft always saves', () => {
  const block = (input: unknown) => ({
    type: 'doc',
    content: [
      { type: 'paragraph', content: [{ type: 'text', text: 'Half-typed notes that must not be lost.' }] },
      { type: 'calculationBlock', attrs: { blockId: '9a1e5d10-2b3c-4d5e-8f90-a1b2c3d4e5f6', kind: 'levels', title: 'Bath levels', input, collapsed: false } },
    ],
  })

  it('stores a block whose temperature has no unit, names it, reloads it intact and refuses to sign it', async () => {
    const created = await amara.post(`/api/notebooks/${notebookId}/entries`, { title: 'Draft with a half-typed block', content: block({ temperature: '300', levels: [{ energy: '0 cm^-1' }] }) })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const id = created.body.entry.id as string
    const edited = block({ temperature: '300', levels: [{ energy: '0 cm^-1' }, { energy: '' }] })
    const saved = await amara.patch(`/api/entries/${id}`, { lockVersion: created.body.entry.lockVersion, content: edited })
    expect(saved.status, JSON.stringify(saved.body)).toBe(200)
    const named = saved.body.incompleteBlocks as { blockTitle: string, field: string, message: string }[]
    expect(named.map(issue => issue.field)).toEqual(expect.arrayContaining(['input.temperature', 'input.levels[1].energy']))
    expect(named.every(issue => issue.blockTitle === 'Bath levels')).toBe(true)
    expect((await amara.get(`/api/entries/${id}`)).body.entry.content).toEqual(edited)
    // A new empty block saves too.
    const empty = await amara.patch(`/api/entries/${id}`, { lockVersion: saved.body.entry.lockVersion, content: block({}) })
    expect(empty.status).toBe(200)
    expect((await amara.get(`/api/entries/${id}`)).body.entry.content).toEqual(block({}))

    const challenge = await amara.post(`/api/entries/${id}/challenge`, { meaning: 'authored' })
    expect([409, 422]).toContain(challenge.status)
    if (challenge.status === 422) expect(challenge.body.message).toMatch(/"Bath levels"/)
  })

  it('still refuses a document the editor could not have made, naming the node', async () => {
    const created = await amara.post(`/api/notebooks/${notebookId}/entries`, { title: 'Draft with a foreign node', content: { type: 'doc', content: [{ type: 'iframe' }] } })
    expect(created.status).toBe(400)
    expect(created.body.message).toMatch(/'iframe' is not allowed/)
  })
})
