import { createHash } from 'node:crypto'
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { as, type Client } from '../support/http'
import { sendRaw, uploadFile } from '../support/upload'

const root = fileURLToPath(new URL('../..', import.meta.url))
// The test server runs with THERMOTOME_DATA_DIR=<repo>/test-artifacts/data (global-setup.ts).
const dataDir = join(root, 'test-artifacts/data')
const uploadsDir = join(dataDir, 'uploads')
const MB = 1000 * 1000

const sha256 = (bytes: Uint8Array | string) => createHash('sha256').update(bytes).digest('hex')

/** Every file below a folder, as paths relative to it. */
function filesUnder(folder: string): string[] {
  if (!existsSync(folder))
    return []
  const found: string[] = []
  const walk = (current: string) => {
    for (const name of readdirSync(current)) {
      const path = join(current, name)
      if (statSync(path).isDirectory()) walk(path)
      else found.push(relative(folder, path))
    }
  }
  walk(folder)
  return found.sort()
}

let database: pg.Client
let amara: Client
let jonah: Client
let priya: Client
let felix: Client
let entryId: string
let otherNotebookEntryId: string

async function attachmentCount(): Promise<number> {
  const { rows } = await database.query('SELECT count(*)::int AS n FROM attachments')
  return rows[0].n
}

async function newDraft(client: Client, notebookId: string, title: string): Promise<string> {
  const reply = await client.post(`/api/notebooks/${notebookId}/entries`, { title })
  expect(reply.status).toBe(201)
  return reply.body.entry.id
}

beforeAll(async () => {
  database = new pg.Client({ connectionString: inject('databaseURL') })
  await database.connect()
  ;[amara, jonah, priya, felix] = await Promise.all([as('amara'), as('jonah'), as('priya'), as('felix')])
  const notebooks = (await jonah.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
  const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!.id
  const nmr = notebooks.find(n => n.name.startsWith('Hyperpolarisation'))!.id
  entryId = await newDraft(amara, infrared, `Data files ${Date.now()}`)
  // Amara is not a member of the NMR notebook: Jonah's entry there is not hers to see.
  otherNotebookEntryId = await newDraft(jonah, nmr, `NMR data files ${Date.now()}`)
})

afterAll(async () => {
  await database.end()
})

const levelsCsv = 'label,energy (cm^-1),g\r\nground,0,1\r\nfirst,667.38,2\r\nsecond,1285.4,1\r\n'

describe('upload, list and download', () => {
  let attachmentId: string
  const name = 'Ørsted niveaux Δν «été» 温度.csv'

  it('stores a CSV and records its SHA-256, size, media type, uploader and time', async () => {
    const before = Date.now()
    const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, name, levelsCsv, 'text/csv')
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    const attachment = reply.body.attachment
    expect(attachment).toMatchObject({
      entryId, name, mediaType: 'text/csv', size: Buffer.byteLength(levelsCsv), sha256: sha256(levelsCsv), detachedAt: null,
      uploader: { name: 'Dr Amara Lindqvist' },
    })
    expect(attachment.storageKey).toBeUndefined()
    const uploadedAt = Date.parse(attachment.uploadedAt)
    expect(uploadedAt).toBeGreaterThanOrEqual(before - 5000)
    expect(uploadedAt).toBeLessThanOrEqual(Date.now() + 5000)
    attachmentId = attachment.id
    // The bytes sit under uploads/<entryId>/<generated key>, not under the uploaded name.
    const { rows } = await database.query('SELECT storage_key FROM attachments WHERE id = $1', [attachmentId])
    expect(rows[0].storage_key).toMatch(new RegExp(`^${entryId}/[0-9a-f-]{36}$`))
    expect(filesUnder(join(uploadsDir, entryId))).toContain(rows[0].storage_key.split('/')[1])
  })

  it('records an attachment_added event in the entry history', async () => {
    const history = await amara.get(`/api/entries/${entryId}/audit`)
    const event = history.body.events.find((e: { action: string, details: { attachmentId?: string } }) => e.action === 'attachment_added' && e.details.attachmentId === attachmentId)
    expect(event).toBeDefined()
    expect(event.details.sha256).toBe(sha256(levelsCsv))
  })

  it('lists the file for every reader of the entry', async () => {
    for (const reader of [amara, priya, felix]) {
      const reply = await reader.get(`/api/entries/${entryId}/attachments`)
      expect(reply.status).toBe(200)
      expect(reply.body.attachments.map((a: { id: string }) => a.id)).toContain(attachmentId)
    }
  })

  it('sends the same bytes back as a download with RFC 6266/5987 headers', async () => {
    const reply = await sendRaw(priya, 'GET', `/api/attachments/${attachmentId}/download`, undefined)
    expect(reply.status).toBe(200)
    const bytes = reply.body as Buffer
    expect(bytes.equals(Buffer.from(levelsCsv))).toBe(true)
    expect(sha256(bytes)).toBe(sha256(levelsCsv))
    expect(reply.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(reply.headers.get('x-content-type-options')).toBe('nosniff')
    const disposition = reply.headers.get('content-disposition')!
    expect(disposition).toMatch(/^attachment;/)
    const encoded = /filename\*=UTF-8''([^;]+)/.exec(disposition)![1]!
    expect(decodeURIComponent(encoded)).toBe(name)
    // The plain filename fallback is ASCII only.
    expect(/filename="([^"]*)"/.exec(disposition)![1]).toMatch(/^[\x20-\x7E]+$/)
  })

  it('previews the table with its header detected', async () => {
    const reply = await amara.get(`/api/attachments/${attachmentId}/preview?rows=2`)
    expect(reply.status).toBe(200)
    expect(reply.body).toMatchObject({
      headers: ['label', 'energy (cm^-1)', 'g'], hasHeader: true, delimiter: ',', totalRows: 3,
      rows: [['ground', '0', '1'], ['first', '667.38', '2']], rowNumbers: [2, 3],
    })
  })

  it('accepts TSV, TXT and JSON files with their media types', async () => {
    const cases = [
      { name: 'lines.tsv', content: 'E\tg\n0\t1\n', mediaType: 'text/tab-separated-values' },
      { name: 'notes.TXT', content: 'plain notes\n', mediaType: 'text/plain' },
      { name: 'fit.json', content: '{"temperature": 296.4}', mediaType: 'application/json' },
    ]
    for (const item of cases) {
      const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, item.name, item.content)
      expect(reply.status, item.name).toBe(201)
      expect(reply.body.attachment.mediaType).toBe(item.mediaType)
    }
  })

  it('removes a file from the draft by detaching it: listed only with ?all=1, still downloadable', async () => {
    const uploaded = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'to-remove.csv', 'E\n1\n')
    const id = uploaded.body.attachment.id
    const removed = await amara.request('DELETE', `/api/attachments/${id}`)
    expect(removed.status).toBe(200)
    expect(removed.body.attachment.detachedAt).not.toBeNull()
    const listed = await amara.get(`/api/entries/${entryId}/attachments`)
    expect(listed.body.attachments.map((a: { id: string }) => a.id)).not.toContain(id)
    const all = await amara.get(`/api/entries/${entryId}/attachments?all=1`)
    expect(all.body.attachments.map((a: { id: string }) => a.id)).toContain(id)
    const download = await sendRaw(amara, 'GET', `/api/attachments/${id}/download`, undefined)
    expect(download.status).toBe(200)
    expect((download.body as Buffer).toString()).toBe('E\n1\n')
    const history = await amara.get(`/api/entries/${entryId}/audit`)
    expect(history.body.events.some((e: { action: string, details: { attachmentId?: string } }) => e.action === 'attachment_removed' && e.details.attachmentId === id)).toBe(true)
  })
})

describe('limits: nothing is stored for a refused file', () => {
  async function expectNothingStored(action: () => Promise<void>) {
    const rowsBefore = await attachmentCount()
    const filesBefore = filesUnder(uploadsDir)
    await action()
    expect(await attachmentCount()).toBe(rowsBefore)
    expect(filesUnder(uploadsDir)).toEqual(filesBefore)
  }

  it('answers 413 for a 21 MB file (declared length over the limit)', async () => {
    await expectNothingStored(async () => {
      const big = new Uint8Array(21 * MB).fill(0x31)
      const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'big.csv', big, 'text/csv')
      expect(reply.status).toBe(413)
      expect(reply.body.message).toMatch(/20 MB/)
    })
  })

  it('accepts a file of exactly 20 MB and gives back the same bytes', async () => {
    const exact = Buffer.alloc(20 * MB, '0.5,1\n')
    const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'exactly-20MB.csv', exact, 'text/csv')
    expect(reply.status).toBe(201)
    expect(reply.body.attachment).toMatchObject({ size: 20 * MB, sha256: sha256(exact) })
    const download = await sendRaw(amara, 'GET', `/api/attachments/${reply.body.attachment.id}/download`, undefined)
    expect(sha256(download.body as Buffer)).toBe(sha256(exact))
    // Remove it again so the list stays short for the tests below.
    expect((await amara.request('DELETE', `/api/attachments/${reply.body.attachment.id}`)).status).toBe(200)
  })

  it('answers 413 for a file one byte over 20 MB (the real size)', async () => {
    await expectNothingStored(async () => {
      const big = new Uint8Array(20 * MB + 1).fill(0x31)
      const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'just-over.csv', big, 'text/csv')
      expect(reply.status).toBe(413)
    })
  })

  it('stops reading a chunked body without a length once it passes the limit', async () => {
    await expectNothingStored(async () => {
      const boundary = 'thermotome-test-boundary'
      const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="stream.csv"\r\nContent-Type: text/csv\r\n\r\n`)
      const chunk = Buffer.alloc(MB, 0x31)
      let sent = 0
      const stream = new ReadableStream<Uint8Array>({
        pull(controller) {
          if (sent === 0) controller.enqueue(head)
          if (sent < 22) { controller.enqueue(chunk); sent++ }
          else { controller.enqueue(Buffer.from(`\r\n--${boundary}--\r\n`)); controller.close() }
        },
      })
      const reply = await sendRaw(amara, 'POST', `/api/entries/${entryId}/attachments`, stream, { 'content-type': `multipart/form-data; boundary=${boundary}` })
      expect(reply.status).toBe(413)
    })
  })

  it('answers 415 for a PNG, an .exe, binary content named .csv, bad UTF-8 and broken JSON', async () => {
    const png = new Uint8Array([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0x00, 0x00, 0x00, 0x0D, 0x49, 0x48, 0x44, 0x52])
    const cases: { name: string, bytes: Uint8Array | string, message: RegExp }[] = [
      { name: 'plot.png', bytes: png, message: /CSV, TSV, TXT or JSON/ },
      { name: 'setup.exe', bytes: 'MZ\u0090 program', message: /CSV, TSV, TXT or JSON/ },
      { name: 'levels.csv', bytes: png, message: /binary/ },
      { name: 'latin1.csv', bytes: new Uint8Array([0x45, 0x2C, 0xE9, 0x0A]), message: /UTF-8/ },
      { name: 'broken.json', bytes: '{"temperature": ', message: /not valid JSON/ },
    ]
    for (const item of cases) {
      await expectNothingStored(async () => {
        const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, item.name, item.bytes)
        expect(reply.status, item.name).toBe(415)
        expect(reply.body.message, item.name).toMatch(item.message)
      })
    }
  })
})

describe('file names cannot escape the storage folder', () => {
  it('stores traversal and absolute names under a generated key with a sanitised display name', async () => {
    const cases = [
      { raw: '../../etc/passwd.csv', shown: 'passwd.csv' },
      { raw: '..\\x.csv', shown: 'x.csv' },
      { raw: '/etc/hosts.csv', shown: 'hosts.csv' },
      { raw: 'C:\\Windows\\win.ini.txt', shown: 'win.ini.txt' },
      { raw: '..\\..\\..\\..\\tmp\\evil.csv', shown: 'evil.csv' },
    ]
    for (const item of cases) {
      const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, item.raw, 'E,g\n0,1\n')
      expect(reply.status, item.raw).toBe(201)
      expect(reply.body.attachment.name).toBe(item.shown)
      const { rows } = await database.query('SELECT storage_key FROM attachments WHERE id = $1', [reply.body.attachment.id])
      const stored = resolve(uploadsDir, rows[0].storage_key)
      expect(stored.startsWith(`${uploadsDir}/`)).toBe(true)
      expect(existsSync(stored)).toBe(true)
    }
    // Nothing landed beside the uploads folder or above the data folder.
    for (const folder of [dataDir, join(root, 'test-artifacts'), root]) {
      for (const escaped of ['etc', 'x.csv', 'passwd.csv', 'hosts.csv', 'evil.csv', 'tmp'])
        expect(existsSync(join(folder, escaped)), join(folder, escaped)).toBe(false)
    }
    // Every stored file is <entryId>/<uuid>.
    for (const path of filesUnder(uploadsDir))
      expect(path).toMatch(/^[0-9a-f-]{36}\/[0-9a-f-]{36}$/)
  })

  it('strips control characters from the display name', async () => {
    const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'spin\u0007 data\u202E.csv', 'E\n0\n')
    expect(reply.status).toBe(201)
    expect(reply.body.attachment.name).toBe('spin data.csv')
  })
})

describe('who may attach, read and remove', () => {
  it('answers 404 for an entry one cannot read, on every route', async () => {
    const upload = await uploadFile(amara, `/api/entries/${otherNotebookEntryId}/attachments`, 'a.csv', 'E\n0\n')
    expect(upload.status).toBe(404)
    expect((await amara.get(`/api/entries/${otherNotebookEntryId}/attachments`)).status).toBe(404)
    const jonahs = await uploadFile(jonah, `/api/entries/${otherNotebookEntryId}/attachments`, 'nmr.csv', 'B,P\n9.4,3.2e-5\n')
    expect(jonahs.status).toBe(201)
    const id = jonahs.body.attachment.id
    expect((await sendRaw(amara, 'GET', `/api/attachments/${id}/download`, undefined)).status).toBe(404)
    expect((await amara.get(`/api/attachments/${id}/preview`)).status).toBe(404)
    expect((await amara.request('DELETE', `/api/attachments/${id}`)).status).toBe(404)
    expect((await amara.get('/api/attachments/00000000-0000-4000-8000-000000000000/preview')).status).toBe(404)
  })

  it('answers 403 to a witness and to a reader who is not the author', async () => {
    const asWitness = await uploadFile(priya, `/api/entries/${entryId}/attachments`, 'w.csv', 'E\n0\n')
    expect(asWitness.status).toBe(403)
    const notAuthor = await uploadFile(jonah, `/api/entries/${entryId}/attachments`, 'j.csv', 'E\n0\n')
    expect(notAuthor.status).toBe(403)
    expect(notAuthor.body.message).toMatch(/author/)
    const listed = await amara.get(`/api/entries/${entryId}/attachments`)
    const id = listed.body.attachments[0].id
    expect((await jonah.request('DELETE', `/api/attachments/${id}`)).status).toBe(403)
  })

  it('answers 409 once the entry is no longer a draft (upload and remove), storing nothing', async () => {
    const notebooks = (await amara.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const signedId = await newDraft(amara, notebooks.find(n => n.name.startsWith('Infrared'))!.id, `Signed data ${Date.now()}`)
    const kept = await uploadFile(amara, `/api/entries/${signedId}/attachments`, 'kept.csv', 'E\n0\n')
    expect(kept.status).toBe(201)
    // Freeze the version as a signature does (the state is derived from entry_versions).
    await database.query(`INSERT INTO entry_versions (entry_id, version, title, content, record, record_hash, frozen_at, frozen_by)
      SELECT id, version, title, content, '{}'::jsonb, repeat('0', 64), now(), author_id FROM entries WHERE id = $1`, [signedId])
    const rowsBefore = await attachmentCount()
    const filesBefore = filesUnder(uploadsDir)
    const upload = await uploadFile(amara, `/api/entries/${signedId}/attachments`, 'late.csv', 'E\n0\n')
    expect(upload.status).toBe(409)
    const remove = await amara.request('DELETE', `/api/attachments/${kept.body.attachment.id}`)
    expect(remove.status).toBe(409)
    expect(await attachmentCount()).toBe(rowsBefore)
    expect(filesUnder(uploadsDir)).toEqual(filesBefore)
    const listed = await amara.get(`/api/entries/${signedId}/attachments`)
    expect(listed.body.attachments[0].detachedAt).toBeNull()
  })
})

describe('integrity', () => {
  it('answers 409 and audits when the stored bytes no longer match the recorded hash', async () => {
    const uploaded = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'tamper.csv', 'E,g\n0,1\n')
    const id = uploaded.body.attachment.id
    const { rows } = await database.query('SELECT storage_key FROM attachments WHERE id = $1', [id])
    writeFileSync(join(uploadsDir, rows[0].storage_key), 'E,g\n0,9\n')
    const reply = await sendRaw(felix, 'GET', `/api/attachments/${id}/download`, undefined)
    expect(reply.status).toBe(409)
    expect(reply.body.message).toMatch(/no longer matches its recorded hash/)
    const audit = await database.query(`SELECT details FROM audit_events WHERE action = 'attachment_integrity_failed' AND details->>'attachmentId' = $1`, [id])
    expect(audit.rows).toHaveLength(1)
    expect(audit.rows[0].details.actualSha256).toBe(sha256('E,g\n0,9\n'))
  })
})

describe('bad input names the field', () => {
  it('refuses a body that is not multipart, a form without a file, and an empty file', async () => {
    const json = await amara.post(`/api/entries/${entryId}/attachments`, { file: 'E,g' })
    expect(json.status).toBe(400)
    expect(json.body.message).toMatch(/^file:/)
    const wrongField = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'a.csv', 'E\n0\n', 'text/csv', 'upload')
    expect(wrongField.status).toBe(400)
    expect(wrongField.body.message).toMatch(/^file:/)
    const empty = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'empty.csv', '')
    expect(empty.status).toBe(400)
    expect(empty.body.message).toMatch(/^file: the file is empty/)
  })

  it('refuses malformed ids and query values', async () => {
    const badEntry = await uploadFile(amara, '/api/entries/not-an-id/attachments', 'a.csv', 'E\n0\n')
    expect(badEntry.status).toBe(400)
    expect(badEntry.body.message).toMatch(/^id:/)
    expect((await amara.get('/api/attachments/not-an-id/download')).body.message).toMatch(/^id:/)
    const all = await amara.get(`/api/entries/${entryId}/attachments?all=yes`)
    expect(all.status).toBe(400)
    expect(all.body.message).toMatch(/^all:/)
    const listed = await amara.get(`/api/entries/${entryId}/attachments`)
    const csv = listed.body.attachments.find((a: { mediaType: string }) => a.mediaType === 'text/csv')
    const rows = await amara.get(`/api/attachments/${csv.id}/preview?rows=0`)
    expect(rows.status).toBe(400)
    expect(rows.body.message).toMatch(/^rows:/)
    const delimiter = await amara.get(`/api/attachments/${csv.id}/preview?delimiter=colon`)
    expect(delimiter.body.message).toMatch(/^delimiter:/)
  })

  it('answers 415 for a preview of a JSON file', async () => {
    const listed = await amara.get(`/api/entries/${entryId}/attachments`)
    const json = listed.body.attachments.find((a: { mediaType: string }) => a.mediaType === 'application/json')
    const reply = await amara.get(`/api/attachments/${json.id}/preview`)
    expect(reply.status).toBe(415)
  })
})

describe('file names with quotes and separators', () => {
  it('keeps a ; and = inside the quoted name (RFC 7578)', async () => {
    const reply = await uploadFile(amara, `/api/entries/${entryId}/attachments`, 'run 7; T=296 K.csv', 'E\n0\n')
    expect(reply.status).toBe(201)
    expect(reply.body.attachment.name).toBe('run 7; T=296 K.csv')
  })

  it('answers 400 for a multipart body cut short', async () => {
    const reply = await sendRaw(amara, 'POST', `/api/entries/${entryId}/attachments`, '--XY\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\nE,g', { 'content-type': 'multipart/form-data; boundary=XY' })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^file:/)
  })
})
