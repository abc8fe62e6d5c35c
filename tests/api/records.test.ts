import { execFileSync, spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { existsSync, mkdirSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import yauzl from 'yauzl'
import { canonicalJson, verifyBundle, type RecordBundle } from '../../shared/records'
import { as, baseURL, type Client } from '../support/http'
import { createSignedRecord, type StoredRecord } from '../support/signedRecords'

const root = fileURLToPath(new URL('../..', import.meta.url))
const artifacts = join(root, 'test-artifacts')
const scratch = mkdtempSync(join(tmpdir(), 'thermotome-records-'))
const sha256 = (data: Uint8Array) => createHash('sha256').update(data).digest('hex')
const AMARA = 'amara.lindqvist@kestrel-ridge.example'
const PRIYA = 'priya.natarajan@kestrel-ridge.example'
const JONAH = 'jonah.whitfield@kestrel-ridge.example'

let felix: Client
let amara: Client
let record: StoredRecord
let awaiting: StoredRecord

/** Raw bytes of a GET (the JSON client would decode them as text). */
async function download(client: Client, path: string) {
  const response = await fetch(`${baseURL()}${path}`, { headers: { cookie: client.cookie, 'x-forwarded-for': client.address } })
  return { status: response.status, headers: response.headers, bytes: new Uint8Array(await response.arrayBuffer()) }
}

async function upload(client: Client, bytes: Uint8Array, name: string, type: string) {
  const form = new FormData()
  form.append('file', new Blob([bytes as Uint8Array<ArrayBuffer>], { type }), name)
  const response = await fetch(`${baseURL()}/api/verify`, { method: 'POST', body: form, headers: { cookie: client.cookie, 'x-forwarded-for': client.address } })
  return { status: response.status, body: await response.json() as any }
}

function cli(file: string) {
  const run = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/verify.ts', file], { cwd: root, encoding: 'utf8', env: { ...process.env, DATABASE_URL: '' } })
  // The command line needs no server: drop pooled connections the server may close while it runs
  // (its keep-alive timeout is 5 s; fetch would otherwise reuse a socket being closed: "other side closed").
  idleSince = Date.now()
  return run
}
let idleSince = 0

/** After a pause as long as the server's keep-alive timeout, one retry of a request whose pooled socket was closed under it. */
async function afterPause<T>(request: () => Promise<T>): Promise<T> {
  try {
    return await request()
  }
  catch (error) {
    if (Date.now() - idleSince < 60_000 && String((error as { cause?: unknown }).cause).includes('other side closed')) return await request()
    throw error
  }
}

beforeAll(async () => {
  mkdirSync(artifacts, { recursive: true })
  felix = await as('felix')
  amara = await as('amara')
  record = await createSignedRecord(inject('databaseURL'), {
    authorEmail: AMARA, witnessEmail: PRIYA, notebook: 'Infrared', title: 'R-branch populations of CO at 298.15 K — Δv = 1 survey',
    signedAt: '2026-04-14T08:05:09.000Z',
    attachments: [{ name: 'r-branch-lines.csv', mediaType: 'text/csv', size: 18244, sha256: sha256(new TextEncoder().encode('r-branch-lines')) }],
  })
  awaiting = await createSignedRecord(inject('databaseURL'), { authorEmail: AMARA, notebook: 'Flame', title: 'Flame temperature, awaiting witness', signedAt: '2026-04-20T12:00:00.000Z' })
})

describe('record PDF', () => {
  let pdf: Uint8Array
  let file: string
  beforeAll(async () => {
    const reply = await download(felix, `/api/records/${record.entryId}/pdf?version=1`)
    expect(reply.status).toBe(200)
    expect(reply.headers.get('content-type')).toBe('application/pdf')
    pdf = reply.bytes
    file = join(artifacts, 'record.pdf')
    writeFileSync(file, pdf)
  })

  it('prints names, e-mails, meanings, UTC times, key fingerprints and the record hash (pdftotext)', () => {
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
    for (const envelope of record.bundle.signatures) {
      const statement = envelope.statement
      expect(text).toContain(statement.signer.name)
      expect(text).toContain(statement.signer.email)
      expect(text).toContain(`${statement.signedAt.slice(0, 10)} ${statement.signedAt.slice(11, 19)} UTC`)
    }
    expect(text).toContain('Authored — signed by the author')
    expect(text).toContain('Witnessed — read and understood')
    expect(text).toContain(record.bundle.recordHash)
    expect(text).toContain('r-branch-lines.csv')
    expect(text).toMatch(/Page 1 of \d+/)
    expect(text).toContain('evidence, not validation')
  })

  it('embeds every font it uses (pdffonts) and passes qpdf --check', () => {
    const fonts = execFileSync('pdffonts', [file], { encoding: 'utf8' }).trim().split('\n').slice(2)
    expect(fonts.length).toBeGreaterThan(0)
    for (const line of fonts) expect(line, line).toMatch(/\s+yes\s+yes\s+yes\s+\d+\s+\d+$/)
    const check = spawnSync('qpdf', ['--check', file], { encoding: 'utf8' })
    expect(check.status, check.stdout + check.stderr).toBe(0)
  })

  it('carries metadata: title, author, creation date = signing time, PDF/A-3b identification', () => {
    const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' })
    expect(info).toContain('R-branch populations of CO')
    expect(info).toContain('Author:          Dr Amara Lindqvist')
    expect(info).toMatch(/CreationDate:\s+Tue Apr 14 09:05:09 2026 UTC/)
    expect(Buffer.from(pdf).toString('latin1')).toContain('<pdfaid:part>3</pdfaid:part>')
  })

  it('gives the same bytes for the same record', async () => {
    const again = await download(felix, `/api/records/${record.entryId}/pdf?version=1`)
    expect(sha256(again.bytes)).toBe(sha256(pdf))
  })

  it('keeps page one as a PNG for people to look at (pdftoppm)', () => {
    execFileSync('pdftoppm', ['-png', '-r', '80', '-f', '1', '-l', '1', '-singlefile', file, join(artifacts, 'record-page1')])
    execFileSync('pdftoppm', ['-png', '-r', '80', '-f', '2', '-l', '3', file, join(artifacts, 'record-page')])
  })

  it('carries the bundle, which verifies through the API and the command line', async () => {
    const reply = await upload(felix, pdf, 'record.pdf', 'application/pdf')
    expect(reply.status, JSON.stringify(reply.body)).toBe(200)
    expect(reply.body.source).toBe('pdf')
    expect(reply.body.report.recordHash.computed).toBe(record.bundle.recordHash)
    expect(reply.body.report.signatures.map((check: { ok: boolean }) => check.ok)).toEqual([true, true])
    const run = cli(file)
    expect(run.status, run.stdout + run.stderr).toBe(0)
    expect(run.stdout).toContain(record.bundle.recordHash)
    expect(run.stdout).toContain('Priya Natarajan')
  })

  it('answers 404 for an unknown record or version and 400 naming the field for bad ids', async () => {
    expect((await afterPause(() => felix.get('/api/records/00000000-0000-4000-8000-000000000000/pdf'))).status).toBe(404)
    expect((await felix.get(`/api/records/${record.entryId}/pdf?version=7`)).status).toBe(404)
    const badId = await felix.get('/api/records/not-a-uuid/pdf')
    expect(badId.status).toBe(400)
    expect(badId.body.message).toMatch(/^id:/)
    const badVersion = await felix.get(`/api/records/${record.entryId}/pdf?version=zero`)
    expect(badVersion.status).toBe(400)
    expect(badVersion.body.message).toMatch(/^version:/)
  })
})

describe('bundle JSON and verification', () => {
  let bundle: RecordBundle
  beforeAll(async () => {
    const reply = await download(amara, `/api/records/${record.entryId}/export.json`)
    expect(reply.status).toBe(200)
    bundle = JSON.parse(new TextDecoder().decode(reply.bytes))
  })

  it('downloads the bundle the signers signed', async () => {
    expect(bundle.recordHash).toBe(record.bundle.recordHash)
    expect((await verifyBundle(bundle)).ok).toBe(true)
    const reply = await amara.post('/api/verify', bundle)
    expect(reply.status).toBe(200)
    expect(reply.body.ok).toBe(true)
    expect(reply.body.record.entryId).toBe(record.entryId)
  })

  it('is the same bundle, byte for byte, as the signing routes serve for that version', async () => {
    const reply = await download(amara, `/api/records/${record.entryId}/bundle`)
    expect(reply.status).toBe(200)
    expect(canonicalJson(JSON.parse(new TextDecoder().decode(reply.bytes)))).toBe(canonicalJson(bundle))
  })

  it('fails a tampered bundle with 422 and says what failed (API and command line)', async () => {
    const tampered = structuredClone(bundle)
    tampered.record.entry.title = 'A different title'
    const reply = await amara.post('/api/verify', tampered)
    expect(reply.status).toBe(422)
    expect(reply.body.data.ok).toBe(false)
    expect(reply.body.data.report.problems.join(' ')).toMatch(/does not match the bundle's recordHash/)
    const file = join(scratch, 'tampered.json')
    writeFileSync(file, JSON.stringify(tampered))
    const run = cli(file)
    expect(run.status).toBe(1)
    expect(run.stdout).toContain('Result: FAILED')
    expect(run.stdout).toContain('the record was changed after signing')
  })

  it('tells apart a file that is no bundle, a PDF without one, and garbage (never 500)', async () => {
    const notBundle = await afterPause(() => amara.post('/api/verify', { hello: 'world' }))
    expect(notBundle.status).toBe(422)
    expect(notBundle.body.message).toMatch(/not a Thermotome record bundle/)
    const garbage = await upload(amara, new TextEncoder().encode('just some text, neither JSON nor PDF'), 'notes.txt', 'text/plain')
    expect(garbage.status).toBe(400)
    const emptyPdf = join(scratch, 'empty.pdf')
    execFileSync('qpdf', ['--empty', emptyPdf])
    const plainPdf = await upload(amara, new Uint8Array(execFileSync('cat', [emptyPdf])), 'plain.pdf', 'application/pdf')
    expect(plainPdf.status).toBe(422)
    expect(plainPdf.body.message).toMatch(/no embedded files/)
    const empty = await amara.request('POST', '/api/verify', '', { 'content-type': 'application/json' })
    expect(empty.status).toBe(400)
    const noFile = await (async () => {
      const form = new FormData()
      form.append('other', 'x')
      const response = await fetch(`${baseURL()}/api/verify`, { method: 'POST', body: form, headers: { cookie: amara.cookie, 'x-forwarded-for': amara.address } })
      return { status: response.status, body: await response.json() as any }
    })()
    expect(noFile.status).toBe(400)
    expect(noFile.body.message).toMatch(/^file:/)
    expect(cli(join(scratch, 'missing.json')).status).toBe(2)
    writeFileSync(join(scratch, 'garbage.txt'), 'neither')
    expect(cli(join(scratch, 'garbage.txt')).status).toBe(2)
  })
})

describe('records search', () => {
  it('filters by notebook, author, witness, state, date range and title, and sorts', async () => {
    const byTitle = await afterPause(() => felix.get(`/api/records?q=${encodeURIComponent('R-branch populations')}`))
    expect(byTitle.status).toBe(200)
    expect(byTitle.body.records.map((row: { entryId: string }) => row.entryId)).toEqual([record.entryId])
    const row = byTitle.body.records[0]
    expect(row).toMatchObject({ version: 1, authorName: 'Dr Amara Lindqvist', witnessName: 'Priya Natarajan', state: 'witnessed', recordHash: record.bundle.recordHash })

    const awaitingOnly = await felix.get('/api/records?state=awaiting_witness&pageSize=200')
    const awaitingIds = awaitingOnly.body.records.map((item: { entryId: string }) => item.entryId)
    expect(awaitingIds).toContain(awaiting.entryId)
    expect(awaitingIds).not.toContain(record.entryId)

    const inRange = await felix.get('/api/records?from=2026-04-14T00:00:00Z&to=2026-04-14T23:59:59Z')
    expect(inRange.body.records.map((item: { entryId: string }) => item.entryId)).toEqual([record.entryId])

    const byPeople = await felix.get(`/api/records?authorId=${record.authorId}&witnessId=${record.witnessId}&notebookId=${record.notebookId}&pageSize=200`)
    expect(byPeople.body.records.every((item: { authorName: string, witnessName: string }) => item.authorName === 'Dr Amara Lindqvist' && item.witnessName === 'Priya Natarajan')).toBe(true)
    expect(byPeople.body.facets.witnesses.map((person: { name: string }) => person.name)).toContain('Priya Natarajan')

    const sorted = await felix.get('/api/records?sort=title&direction=asc&pageSize=200')
    const titles = sorted.body.records.map((item: { title: string }) => item.title.toLowerCase())
    expect(titles).toEqual([...titles].sort((left: string, right: string) => (left < right ? -1 : left > right ? 1 : 0)))
    const pageTwo = await felix.get('/api/records?pageSize=1&page=2')
    expect(pageTwo.body.records).toHaveLength(1)
    expect(pageTwo.body.total).toBeGreaterThanOrEqual(2)
  })

  it('names the field of a bad filter', async () => {
    const reply = await felix.get('/api/records?from=yesterday')
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^from:/)
    const sort = await felix.get('/api/records?sort=colour')
    expect(sort.status).toBe(400)
    expect(sort.body.message).toMatch(/^sort:/)
  })
})

async function waitForJob(client: Client, id: string, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const { body } = await client.get(`/api/exports/${id}`)
    if (!['queued', 'running'].includes(body.job.status) || Date.now() > deadline) return body.job
    await new Promise(resolve => setTimeout(resolve, 500))
  }
}

/** A bulk export of felix's whose server stopped ten minutes ago (stale heartbeat), for the resume loop to pick up. */
async function insertStaleJob(records: { entryId: string, version: number }[], done: number): Promise<string> {
  const client = new pg.Client({ connectionString: inject('databaseURL') })
  await client.connect()
  try {
    const { rows: [felixRow] } = await client.query("SELECT id FROM people WHERE email LIKE 'felix%'")
    const { rows: [row] } = await client.query(
      `INSERT INTO export_jobs (requested_by, parameters, status, total, done, started_at, heartbeat_at)
       VALUES ($1, $2, 'running', $3, $4, now() - interval '10 minutes', now() - interval '10 minutes') RETURNING id`,
      [felixRow.id, JSON.stringify({ request: { records }, records }), records.length, done],
    )
    return row.id
  }
  finally { await client.end() }
}

/** Every entry of a zip as name → bytes (yauzl). */
function readZip(bytes: Uint8Array): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(Buffer.from(bytes), { lazyEntries: true }, (error, zip) => {
      if (error || !zip) return reject(error)
      const files = new Map<string, Buffer>()
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (streamError, stream) => {
          if (streamError || !stream) return reject(streamError)
          const chunks: Buffer[] = []
          stream.on('data', (chunk: Buffer) => chunks.push(chunk))
          stream.on('end', () => { files.set(entry.fileName, Buffer.concat(chunks)); zip.readEntry() })
        })
      })
      zip.on('end', () => resolve(files))
      zip.on('error', reject)
      zip.readEntry()
    })
  })
}

describe('bulk export', () => {
  it('exports 200 signed records of a date range as a zip whose manifest hashes every file', { timeout: 600_000 }, async () => {
    const client = new pg.Client({ connectionString: inject('databaseURL') })
    await client.connect()
    const made: StoredRecord[] = []
    try {
      for (let index = 0; index < 200; index++) {
        made.push(await createSignedRecord(inject('databaseURL'), {
          authorEmail: index % 2 ? AMARA : JONAH, witnessEmail: PRIYA, notebook: 'Infrared', title: `Bulk run ${String(index).padStart(3, '0')}`,
          signedAt: new Date(Date.UTC(2025, 5, 1, 8, 0, index)).toISOString(),
          blocks: [{ kind: 'levels', title: 'Two levels', input: { levels: [{ energy: '0 cm^-1' }, { energy: `${100 + index} cm^-1`, degeneracy: 3 }], temperature: '300 K' } }],
        }, client))
      }
    }
    finally { await client.end() }
    const started = await felix.post('/api/exports', { filters: { from: '2025-06-01T00:00:00Z', to: '2025-06-01T23:59:59Z' } })
    expect(started.status, JSON.stringify(started.body)).toBe(202)
    expect(started.body.job.total).toBe(200)
    const job = await waitForJob(felix, started.body.job.id, 540_000)
    expect(job.status, job.error).toBe('done')
    expect(job.done).toBe(200)

    const zip = await download(felix, `/api/exports/${job.id}/download`)
    expect(zip.status).toBe(200)
    expect(zip.headers.get('content-type')).toBe('application/zip')
    const files = await readZip(zip.bytes)
    const folder = `thermotome-export-${job.id}`
    const manifest = JSON.parse(files.get(`${folder}/manifest.json`)!.toString('utf8'))
    expect(manifest.records).toHaveLength(200)
    expect(new Set(manifest.records.map((item: { entryId: string }) => item.entryId))).toEqual(new Set(made.map(item => item.entryId)))
    expect(manifest.files).toHaveLength(400)
    for (const file of manifest.files as { path: string, sha256: string, bytes: number }[]) {
      const data = files.get(`${folder}/${file.path}`)
      expect(data, file.path).toBeDefined()
      expect(sha256(data!), file.path).toBe(file.sha256)
      expect(data!.length).toBe(file.bytes)
    }
    expect(files.size).toBe(401)
    const oneBundle = JSON.parse(files.get(`${folder}/${manifest.records[0].files[1].path}`)!.toString('utf8'))
    expect((await verifyBundle(oneBundle)).ok).toBe(true)
  })

  it('cancels a running export and refuses to cancel it twice', async () => {
    const started = await felix.post('/api/exports', { filters: { from: '2025-06-01T00:00:00Z', to: '2025-06-01T23:59:59Z' } })
    expect(started.status).toBe(202)
    const cancelled = await felix.post(`/api/exports/${started.body.job.id}/cancel`)
    expect(cancelled.status).toBe(200)
    expect(cancelled.body.job.status).toBe('cancelled')
    const job = await waitForJob(felix, started.body.job.id, 10_000)
    expect(job.status).toBe('cancelled')
    expect(job.done).toBeLessThan(200)
    expect((await felix.post(`/api/exports/${started.body.job.id}/cancel`)).status).toBe(409)
    expect((await felix.get(`/api/exports/${started.body.job.id}/download`)).status).toBe(409)
  })

  it('resumes a job whose server stopped (stale heartbeat) and finishes it', { timeout: 120_000 }, async () => {
    const jobId = await insertStaleJob([{ entryId: record.entryId, version: 1 }, { entryId: awaiting.entryId, version: 1 }], 1)
    const job = await waitForJob(felix, jobId, 100_000)
    expect(job.status, job.error).toBe('done')
    expect(job.done).toBe(2)
  })

  it('removes the files a job rendered before it failed', { timeout: 120_000 }, async () => {
    // A resumed job whose second record has gone: the first record's files, already stored, go too.
    const exportsFolder = join(root, 'test-artifacts', 'data', 'exports')
    const gone = { entryId: '00000000-0000-4000-8000-00000000dead', version: 1 }
    const jobId = await insertStaleJob([{ entryId: record.entryId, version: 1 }, gone], 0)
    const job = await waitForJob(felix, jobId, 100_000)
    expect(job.status).toBe('failed')
    expect(job.error).toMatch(/no longer available/)
    expect(job.downloadable).toBe(false)
    // The fs storage keeps a job's files under a folder named after it (empty folders may stay).
    const folder = join(exportsFolder, jobId)
    const left = existsSync(folder) ? readdirSync(folder, { recursive: true, withFileTypes: true }).filter(item => item.isFile()).map(item => item.name) : []
    expect(left).toEqual([])
  })

  it('refuses a selection with a record the person may not read, and an empty or mixed request', async () => {
    const other = await createSignedRecord(inject('databaseURL'), { authorEmail: JONAH, witnessEmail: PRIYA, notebook: 'Hyperpolarisation', title: 'NMR record for the export check' })
    const refused = await amara.post('/api/exports', { records: [{ entryId: record.entryId, version: 1 }, { entryId: other.entryId, version: 1 }] })
    expect(refused.status).toBe(404)
    const neither = await amara.post('/api/exports', {})
    expect(neither.status).toBe(400)
    expect(neither.body.message).toMatch(/^records:/)
    const badRecord = await amara.post('/api/exports', { records: [{ entryId: 'nope', version: 1 }] })
    expect(badRecord.status).toBe(400)
    expect(badRecord.body.message).toMatch(/^records\[0\]\.entryId:/)
    const nothing = await felix.post('/api/exports', { filters: { from: '1990-01-01T00:00:00Z', to: '1990-01-02T00:00:00Z' } })
    expect(nothing.status).toBe(422)
  })
})

describe('audit trail CSV', () => {
  it('exports filtered events as CSV, escaped and safe from formulas', async () => {
    const client = new pg.Client({ connectionString: inject('databaseURL') })
    await client.connect()
    try {
      // An event whose text would run as a spreadsheet formula, written through the same chain rules.
      const { auditRowHash, GENESIS_HASH } = await import('../../server/database/audit-chain')
      await client.query('BEGIN')
      await client.query('SELECT pg_advisory_xact_lock(874202)')
      const { rows: [last] } = await client.query('SELECT hash FROM audit_events ORDER BY sequence DESC LIMIT 1')
      const row = { occurredAt: new Date(), actorId: null, actorEmail: '=HYPERLINK("http://example.invalid","x")', action: 'csv_check', subjectType: 'test', subjectId: 'a,"b"', details: { note: '@SUM(1)' }, previousHash: last?.hash ?? GENESIS_HASH }
      await client.query('INSERT INTO audit_events (occurred_at, actor_id, actor_email, action, subject_type, subject_id, details, previous_hash, hash) VALUES ($1,$2,$3,$4,$5,$6,$7,$8,$9)',
        [row.occurredAt, row.actorId, row.actorEmail, row.action, row.subjectType, row.subjectId, JSON.stringify(row.details), row.previousHash, auditRowHash(row)])
      await client.query('COMMIT')
    }
    finally { await client.end() }
    const reply = await felix.get('/api/audit/export.csv?action=csv_check')
    expect(reply.status).toBe(200)
    expect(reply.headers.get('content-type')).toMatch(/^text\/csv/)
    const lines = (reply.body as string).trim().split('\r\n')
    expect(lines[0]).toBe('sequence,occurredAt,action,actorEmail,actorId,subjectType,subjectId,details,previousHash,hash,actorName,subjectName')
    expect(lines).toHaveLength(2)
    expect(lines[1]).toContain(`"'=HYPERLINK(""http://example.invalid"",""x"")"`)
    expect(lines[1]).toContain('"a,""b"""')
    const filtered = await felix.get(`/api/audit?person=amara&subjectId=${record.entryId}`)
    expect(filtered.body.events.length).toBeGreaterThan(0)
    expect(filtered.body.events.every((event: { actorEmail: string }) => event.actorEmail.includes('amara'))).toBe(true)
    const bad = await felix.get('/api/audit/export.csv?from=last-week')
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^from:/)
  })
})

describe('bulk export of something never signed', () => {
  it('is refused up front (404 naming it), not failed later in the job', async () => {
    const officer = await as('felix')
    const drafts = (await officer.get('/api/notebooks')).body.notebooks
    const entries = (await officer.get(`/api/notebooks/${drafts[0].id}/entries?state=draft`)).body.entries
    const reply = await officer.post('/api/exports', { records: [{ entryId: entries[0].id, version: 1 }] })
    expect(reply.status).toBe(404)
    expect(reply.body.message).toMatch(/do not exist or are not yours to export/)
  })
})
