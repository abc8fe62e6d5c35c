// Retention of bulk export files: the sweep (expireExportFiles) runs hourly in the server, so the
// test calls it itself, against the test database and the server's own exports folder
// (test-artifacts/data/exports, THERMOTOME_DATA_DIR of tests/support/global-setup.ts), after
// ageing finished_at in the database. What people see is then checked over HTTP.
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { drizzle } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import { createStorage } from 'unstorage'
import fsDriver from 'unstorage/drivers/fs'
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest'
import * as schema from '../../server/database/schema'
import type { Database } from '../../server/utils/db'
import { expireExportFiles } from '../../server/utils/exportJobs'
import { as, baseURL, type Client } from '../support/http'
import { createSignedRecord } from '../support/signedRecords'

const root = fileURLToPath(new URL('../..', import.meta.url))
const storage = createStorage({ driver: fsDriver({ base: join(root, 'test-artifacts', 'data', 'exports') }) })
const AMARA = 'amara.lindqvist@kestrel-ridge.example'
const PRIYA = 'priya.natarajan@kestrel-ridge.example'
const REMOVED = 'The files of this export were removed after 7 days; run the export again.'

let felix: Client
let pool: pg.Pool
let database: Database
let records: { entryId: string, version: number }[]

/** Starts a bulk export of the test's record as felix (compliance) and waits until it is done. */
async function finishedExport(): Promise<string> {
  const started = await felix.post('/api/exports', { records })
  expect(started.status, JSON.stringify(started.body)).toBe(202)
  const deadline = Date.now() + 100_000
  for (;;) {
    const { body } = await felix.get(`/api/exports/${started.body.job.id}`)
    if (!['queued', 'running'].includes(body.job.status)) {
      expect(body.job.status, body.job.error).toBe('done')
      return body.job.id
    }
    if (Date.now() > deadline) throw new Error('the export did not finish within 100 s')
    await new Promise(resolve => setTimeout(resolve, 500))
  }
}

const finishedDaysAgo = (jobId: string, days: number) =>
  pool.query(`UPDATE export_jobs SET finished_at = now() - make_interval(days => $2) WHERE id = $1`, [jobId, days])

async function storageKey(jobId: string): Promise<string | null> {
  const { rows: [row] } = await pool.query('SELECT storage_key FROM export_jobs WHERE id = $1', [jobId])
  return row.storage_key
}

async function expiredEvents(jobId: string) {
  const reply = await felix.get(`/api/audit?action=export_expired&subjectId=${jobId}`)
  expect(reply.status).toBe(200)
  return reply.body.events as { actorEmail: string | null, subjectType: string, details: Record<string, unknown> }[]
}

beforeAll(async () => {
  felix = await as('felix')
  pool = new pg.Pool({ connectionString: inject('databaseURL'), max: 4 })
  database = drizzle(pool, { schema })
  const record = await createSignedRecord(inject('databaseURL'), {
    authorEmail: AMARA, witnessEmail: PRIYA, notebook: 'Infrared', title: 'Band origin of CO for the export retention check', signedAt: '2026-03-02T09:00:00.000Z',
  })
  records = [{ entryId: record.entryId, version: 1 }]
})

afterAll(async () => {
  await pool?.end()
})

describe('bulk export retention', () => {
  it('removes the files of an export finished longer ago than the retention; a younger one stays downloadable', { timeout: 240_000 }, async () => {
    const old = await finishedExport()
    const young = await finishedExport()
    expect((await storage.getKeys(`${old}:`)).length).toBeGreaterThan(0)
    // One record: its PDF, its bundle JSON, its summary and the manifest.
    const youngKeys = await storage.getKeys(`${young}:`)
    expect(youngKeys).toHaveLength(4)
    await finishedDaysAgo(old, 8)
    await finishedDaysAgo(young, 6)

    const removed = await expireExportFiles({ database, storage, retentionDays: 7 })
    expect(removed).toContain(old)
    expect(removed).not.toContain(young)

    expect(await storage.getKeys(`${old}:`)).toEqual([])
    expect(await storageKey(old)).toBeNull()
    expect((await storage.getKeys(`${young}:`)).sort()).toEqual(youngKeys.sort())
    expect(await storageKey(young)).toBe(`exports:${young}`)

    const oldView = (await felix.get(`/api/exports/${old}`)).body.job
    expect(oldView).toMatchObject({ status: 'done', downloadable: false, filesRemoved: true })
    const youngView = (await felix.get(`/api/exports/${young}`)).body.job
    expect(youngView).toMatchObject({ status: 'done', downloadable: true, filesRemoved: false })
    const list = (await felix.get('/api/exports')).body
    expect(list.retentionDays).toBe(7)
    expect(list.jobs.find((job: { id: string }) => job.id === old)).toMatchObject({ downloadable: false, filesRemoved: true })

    const gone = await felix.get(`/api/exports/${old}/download`)
    expect(gone.status).toBe(410)
    expect(gone.body.message).toBe(REMOVED)
    const zip = await fetch(`${baseURL()}/api/exports/${young}/download`, { headers: { cookie: felix.cookie, 'x-forwarded-for': felix.address } })
    expect(zip.status).toBe(200)
    expect(zip.headers.get('content-type')).toBe('application/zip')
    expect((await zip.arrayBuffer()).byteLength).toBeGreaterThan(0)

    const events = await expiredEvents(old)
    expect(events).toHaveLength(1)
    expect(events[0]).toMatchObject({ actorEmail: null, subjectType: 'export', details: { records: 1, retentionDays: 7 } })
    expect(await expiredEvents(young)).toEqual([])

    // A second sweep finds nothing more to do for it; the audit chain still verifies.
    expect(await expireExportFiles({ database, storage, retentionDays: 7 })).not.toContain(old)
    expect(await expiredEvents(old)).toHaveLength(1)
    expect((await felix.get('/api/audit/verify')).body.ok).toBe(true)
  })

  it('two servers sweeping at once remove each export once', { timeout: 180_000 }, async () => {
    const job = await finishedExport()
    await finishedDaysAgo(job, 30)
    // A second copy of the module stands for a second app server (its own in-process guard).
    vi.resetModules()
    const other = await import('../../server/utils/exportJobs')
    expect(other.expireExportFiles).not.toBe(expireExportFiles)
    const otherPool = new pg.Pool({ connectionString: inject('databaseURL'), max: 2 })
    try {
      const [first, second] = await Promise.all([
        expireExportFiles({ database, storage, retentionDays: 7 }),
        other.expireExportFiles({ database: drizzle(otherPool, { schema }), storage, retentionDays: 7 }),
      ])
      expect([...first, ...second].filter(id => id === job)).toEqual([job])
    }
    finally { await otherPool.end() }
    expect(await storage.getKeys(`${job}:`)).toEqual([])
    expect(await storageKey(job)).toBeNull()
    expect(await expiredEvents(job)).toHaveLength(1)
    const gone = await felix.get(`/api/exports/${job}/download`)
    expect(gone.status).toBe(410)
    expect(gone.body.message).toBe(REMOVED)
  })
})
