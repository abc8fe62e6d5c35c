import { Readable } from 'node:stream'
import { createHash } from 'node:crypto'
import { and, eq, inArray, isNotNull, lt, sql } from 'drizzle-orm'
import { ZipArchive } from 'archiver'
import { MAX_EXPORT_RECORDS, type ExportRequest } from '#shared/schemas/records'
import { canonicalJson } from '#shared/records'
import { entries, entryVersions, exportJobs, notebookMembers, signatures, type ExportJob } from '../database/schema'
import type { SessionPerson } from './auth'
import { recordAudit } from './audit'
import type { Database } from './db'

/** A job whose heartbeat is older than this was abandoned (its server stopped) and may be resumed. */
export const EXPORT_HEARTBEAT_STALE_MS = 30_000
const HEARTBEAT_EVERY_MS = 5_000
/** Days the files of a finished export are kept unless THERMOTOME_EXPORT_RETENTION_DAYS says otherwise. */
export const DEFAULT_EXPORT_RETENTION_DAYS = 7
const DAY_MS = 24 * 60 * 60 * 1000

interface ExportParameters {
  request: ExportRequest
  records: { entryId: string, version: number }[]
}
interface StoredRecordFiles { entryId: string, version: number, title: string, notebook: string, recordHash: string, files: { path: string, sha256: string, bytes: number }[] }

export const exportStorage = () => useStorage('exports')
const recordKey = (jobId: string, index: number) => `${jobId}:records:${String(index).padStart(6, '0')}.json`
const fileKey = (jobId: string, path: string) => `${jobId}:files:${path.replace(/\//g, ':')}`
const sha256 = (data: Uint8Array) => createHash('sha256').update(data).digest('hex')

/** Keeps the signed (entry, version) pairs this person may export: all for compliance/admin, else their own in their notebooks. */
async function keysThePersonMayExport(person: SessionPerson, keys: { entryId: string, version: number }[]) {
  if (keys.length === 0) return keys
  const entryIds = [...new Set(keys.map(key => key.entryId))]
  const allowed = new Set<string>()
  for (let index = 0; index < entryIds.length; index += 1000) {
    const slice = entryIds.slice(index, index + 1000)
    if (readsAllNotebooks(person)) {
      // Records officers export everything, but only versions that were signed (frozen).
      const frozen = await useDatabase().select({ entryId: entryVersions.entryId, version: entryVersions.version }).from(entryVersions)
        .where(inArray(entryVersions.entryId, slice))
      for (const row of frozen) allowed.add(`${row.entryId}@${row.version}`)
      continue
    }
    const rows = await useDatabase().selectDistinct({ entryId: entryVersions.entryId, version: entryVersions.version }).from(entryVersions)
      .innerJoin(entries, eq(entries.id, entryVersions.entryId))
      .innerJoin(notebookMembers, and(eq(notebookMembers.notebookId, entries.notebookId), eq(notebookMembers.personId, person.id)))
      .leftJoin(signatures, and(eq(signatures.entryVersionId, entryVersions.id), eq(signatures.signerId, person.id)))
      .where(and(inArray(entryVersions.entryId, slice), sql`(${entries.authorId} = ${person.id} OR ${signatures.id} IS NOT NULL)`))
    for (const row of rows) allowed.add(`${row.entryId}@${row.version}`)
  }
  return keys.filter(key => allowed.has(`${key.entryId}@${key.version}`))
}

/** Records a bulk export job for what the person may export, then starts it in this process. */
export async function createExportJob(person: SessionPerson, request: ExportRequest): Promise<ExportJob> {
  let keys: { entryId: string, version: number }[]
  if (request.records) {
    const unique = [...new Map(request.records.map(key => [`${key.entryId}@${key.version}`, key])).values()]
    keys = await keysThePersonMayExport(person, unique)
    if (keys.length < unique.length) {
      const allowed = new Set(keys.map(key => `${key.entryId}@${key.version}`))
      const missing = unique.filter(key => !allowed.has(`${key.entryId}@${key.version}`))
      throw createError({ statusCode: 404, message: `${missing.length} of the chosen records do not exist or are not yours to export (first: entry ${missing[0]!.entryId}, version ${missing[0]!.version}).`, data: { missing: missing.slice(0, 20) } })
    }
  }
  else {
    keys = await keysThePersonMayExport(person, await recordKeysMatching(request.filters!, MAX_EXPORT_RECORDS + 1))
    if (keys.length > MAX_EXPORT_RECORDS)
      throw createError({ statusCode: 422, message: `More than ${MAX_EXPORT_RECORDS} records match: narrow the date range or the filters.` })
  }
  if (keys.length === 0) throw createError({ statusCode: 422, message: 'No signed records match: nothing to export.' })
  const database = useDatabase()
  const job = await database.transaction(async (tx) => {
    const [created] = await tx.insert(exportJobs).values({ requestedBy: person.id, parameters: { request, records: keys } satisfies ExportParameters, total: keys.length }).returning()
    await recordAudit(database, { action: 'export_requested', actorId: person.id, actorEmail: person.email, subjectType: 'export', subjectId: created!.id, details: { records: keys.length } }, tx)
    return created!
  })
  void runExportJob(job.id)
  return job
}

/** Takes the job if it is queued or abandoned (stale heartbeat); several servers may race, one wins. */
async function claimJob(jobId: string): Promise<ExportJob | null> {
  const staleBefore = new Date(Date.now() - EXPORT_HEARTBEAT_STALE_MS)
  const [job] = await useDatabase().update(exportJobs)
    .set({ status: 'running', startedAt: sql`coalesce(${exportJobs.startedAt}, now())`, heartbeatAt: new Date() })
    .where(and(eq(exportJobs.id, jobId), sql`(${exportJobs.status} = 'queued' OR (${exportJobs.status} = 'running' AND (${exportJobs.heartbeatAt} IS NULL OR ${exportJobs.heartbeatAt} < ${staleBefore})))`))
    .returning()
  return job ?? null
}

const runningHere = new Set<string>()

/**
 * Renders each record of the job into storage (PDF and bundle JSON, with their SHA-256), then
 * the manifest. Files already stored by an earlier, interrupted run are re-used: a record's
 * files are only counted once its summary is stored, and rendering is deterministic.
 */
export async function runExportJob(jobId: string): Promise<void> {
  if (runningHere.has(jobId)) return
  runningHere.add(jobId)
  const database = useDatabase()
  const storage = exportStorage()
  let beat: ReturnType<typeof setInterval> | undefined
  try {
    const job = await claimJob(jobId)
    if (!job) return
    const person = await findPerson(job.requestedBy)
    if (!person || person.disabled) throw new Error('the person who asked for this export can no longer sign in')
    const { records } = job.parameters as ExportParameters
    let cancelled = false
    beat = setInterval(() => {
      database.update(exportJobs).set({ heartbeatAt: new Date() }).where(and(eq(exportJobs.id, jobId), eq(exportJobs.status, 'running'))).returning({ id: exportJobs.id })
        .then((rows) => { if (rows.length === 0) cancelled = true })
        .catch(() => {})
    }, HEARTBEAT_EVERY_MS)
    for (let index = 0; index < records.length && !cancelled; index++) {
      if (!(await storage.hasItem(recordKey(jobId, index)))) {
        const key = records[index]!
        const record = await loadBundleForExport(key.entryId, key.version)
        if (!record || (await mayExportRecord(person, record)) !== 'yes')
          throw new Error(`entry ${key.entryId} version ${key.version} is no longer available to ${person.email}`)
        const stem = recordFileStem(record)
        const pdf = await renderRecordPdf(record)
        const json = Buffer.from(canonicalJson(record.bundle as never), 'utf8')
        const files = [{ path: `records/${stem}.pdf`, data: pdf }, { path: `records/${stem}.json`, data: json }]
        for (const file of files) await storage.setItemRaw(fileKey(jobId, file.path), file.data)
        const summary: StoredRecordFiles = {
          entryId: key.entryId, version: key.version, title: record.bundle.record.entry.title, notebook: record.bundle.record.entry.notebook.name,
          recordHash: record.bundle.recordHash, files: files.map(file => ({ path: file.path, sha256: sha256(file.data), bytes: file.data.length })),
        }
        await storage.setItem(recordKey(jobId, index), summary)
      }
      const [current] = await database.update(exportJobs).set({ done: index + 1, heartbeatAt: new Date() })
        .where(and(eq(exportJobs.id, jobId), eq(exportJobs.status, 'running'))).returning({ id: exportJobs.id })
      if (!current) cancelled = true
    }
    if (cancelled) {
      await removeExportFiles(jobId)
      return
    }
    const summaries: StoredRecordFiles[] = []
    for (let index = 0; index < records.length; index++) summaries.push((await storage.getItem(recordKey(jobId, index))) as StoredRecordFiles)
    const manifest = {
      schema: 'thermotome.export-manifest/1',
      job: jobId,
      requestedBy: { id: person.id, name: person.name, email: person.email },
      requestedAt: job.createdAt.toISOString(),
      request: (job.parameters as ExportParameters).request,
      records: summaries,
      files: summaries.flatMap(summary => summary.files),
      howToVerify: 'Each PDF carries its bundle; check either with `npm run verify -- FILE`. Each file\'s SHA-256 is listed here.',
    }
    await storage.setItemRaw(`${jobId}:manifest.json`, Buffer.from(`${JSON.stringify(manifest, null, 2)}\n`, 'utf8'))
    await database.transaction(async (tx) => {
      const [finished] = await tx.update(exportJobs).set({ status: 'done', done: records.length, storageKey: `exports:${jobId}`, finishedAt: new Date(), heartbeatAt: new Date() })
        .where(and(eq(exportJobs.id, jobId), eq(exportJobs.status, 'running'))).returning()
      if (finished)
        await recordAudit(database, { action: 'export_completed', actorId: person.id, actorEmail: person.email, subjectType: 'export', subjectId: jobId, details: { records: records.length } }, tx)
    })
  }
  catch (error) {
    const message = error instanceof Error ? error.message : String(error)
    console.error(`[exports] job ${jobId} failed:`, message)
    await database.update(exportJobs).set({ status: 'failed', error: message.slice(0, 1000), finishedAt: new Date() })
      .where(and(eq(exportJobs.id, jobId), eq(exportJobs.status, 'running'))).catch(() => {})
    // A failed job is never resumed: the files it rendered so far would only fill the data folder.
    await removeExportFiles(jobId).catch(removal => console.error(`[exports] could not remove the files of failed job ${jobId}:`, removal instanceof Error ? removal.message : removal))
  }
  finally {
    if (beat) clearInterval(beat)
    runningHere.delete(jobId)
  }
}

type ExportFileStore = Pick<ReturnType<typeof exportStorage>, 'getKeys' | 'removeItem'>

export async function removeExportFiles(jobId: string, storage: ExportFileStore = exportStorage()) {
  for (const key of await storage.getKeys(`${jobId}:`)) await storage.removeItem(key)
}

const retentionWarnings = new Set<string>()

/**
 * How many days the files of a finished export are kept: THERMOTOME_EXPORT_RETENTION_DAYS, a
 * positive number (fractions allowed), 7 when unset. Any other value is reported once and 7 used.
 */
export function exportRetentionDays(): number {
  const configured = process.env.THERMOTOME_EXPORT_RETENTION_DAYS
  if (configured === undefined || configured.trim() === '') return DEFAULT_EXPORT_RETENTION_DAYS
  const days = Number(configured)
  if (Number.isFinite(days) && days > 0) return days
  if (!retentionWarnings.has(configured)) {
    retentionWarnings.add(configured)
    console.warn(`[exports] THERMOTOME_EXPORT_RETENTION_DAYS=${JSON.stringify(configured)} is not a positive number of days; keeping the files of finished exports for ${DEFAULT_EXPORT_RETENTION_DAYS} days.`)
  }
  return DEFAULT_EXPORT_RETENTION_DAYS
}

/** "1 day", "7 days", "0.5 days". */
export const retentionDaysText = (days: number) => `${days} ${days === 1 ? 'day' : 'days'}`

let expiringHere = false

/**
 * Removes the stored files of exports that finished more than the retention period ago and sets
 * their storageKey to null; the job row stays (the view then says the files were removed).
 * Each job is taken by one conditional UPDATE (still done, files still stored, finished before
 * the cutoff) in a transaction that also removes the files and records 'export_expired': a
 * second app server's UPDATE of the same row waits for that transaction and then matches
 * nothing; if removing the files fails, the change rolls back and the next sweep tries again.
 * Returns the ids of the jobs whose files were removed. The options are for tests.
 */
export async function expireExportFiles(options: { database?: Database, storage?: ExportFileStore, retentionDays?: number, now?: Date } = {}): Promise<string[]> {
  if (expiringHere) return []
  expiringHere = true
  try {
    const database = options.database ?? useDatabase()
    const storage = options.storage ?? exportStorage()
    const retentionDays = options.retentionDays ?? exportRetentionDays()
    const cutoff = new Date((options.now ?? new Date()).getTime() - retentionDays * DAY_MS)
    const expired = and(eq(exportJobs.status, 'done'), isNotNull(exportJobs.storageKey), lt(exportJobs.finishedAt, cutoff))
    const due = await database.select({ id: exportJobs.id }).from(exportJobs).where(expired).orderBy(exportJobs.finishedAt, exportJobs.id)
    const removed: string[] = []
    for (const { id } of due) {
      try {
        const done = await database.transaction(async (tx) => {
          const [job] = await tx.update(exportJobs).set({ storageKey: null }).where(and(eq(exportJobs.id, id), expired)).returning()
          if (!job) return false
          await removeExportFiles(id, storage)
          await recordAudit(database, {
            action: 'export_expired', actorId: null, actorEmail: null, subjectType: 'export', subjectId: id,
            details: { records: job.total, finishedAt: job.finishedAt?.toISOString() ?? null, retentionDays },
          }, tx)
          return true
        })
        if (done) removed.push(id)
      }
      catch (error) {
        console.error(`[exports] could not remove the files of export ${id}:`, error instanceof Error ? error.message : error)
      }
    }
    return removed
  }
  finally {
    expiringHere = false
  }
}

/** Picks up queued jobs and running jobs whose server stopped (stale heartbeat). */
export async function resumeExportJobs(): Promise<number> {
  const staleBefore = new Date(Date.now() - EXPORT_HEARTBEAT_STALE_MS)
  const rows = await useDatabase().select({ id: exportJobs.id }).from(exportJobs)
    .where(sql`${exportJobs.status} = 'queued' OR (${exportJobs.status} = 'running' AND (${exportJobs.heartbeatAt} IS NULL OR ${exportJobs.heartbeatAt} < ${staleBefore}))`)
  for (const row of rows) void runExportJob(row.id)
  return rows.length
}

/** The finished export as a zip stream: the stored files and the manifest, in a fixed order with fixed dates. */
export async function exportZipStream(job: ExportJob): Promise<ZipArchive> {
  const storage = exportStorage()
  const folder = `thermotome-export-${job.id}`
  const date = job.createdAt
  const archive = new ZipArchive({ zlib: { level: 6 } })
  const { records } = job.parameters as ExportParameters
  const lazy = (key: string) => Readable.from((async function* () {
    const data = await storage.getItemRaw(key)
    if (!data) throw new Error(`the stored export file ${key} is missing`)
    yield Buffer.from(data as Uint8Array)
  })())
  for (let index = 0; index < records.length; index++) {
    const summary = (await storage.getItem(recordKey(job.id, index))) as StoredRecordFiles | null
    if (!summary) throw createError({ statusCode: 410, message: 'The files of this export are no longer stored; run the export again.' })
    for (const file of summary.files)
      archive.append(lazy(fileKey(job.id, file.path)), { name: `${folder}/${file.path}`, date, store: file.path.endsWith('.pdf') })
  }
  archive.append(lazy(`${job.id}:manifest.json`), { name: `${folder}/manifest.json`, date })
  void archive.finalize()
  return archive
}

/** The job if this person may see it: the one who asked, or compliance/admin. */
export async function visibleExportJob(person: SessionPerson, jobId: string): Promise<ExportJob> {
  const [job] = await useDatabase().select().from(exportJobs).where(eq(exportJobs.id, jobId)).limit(1)
  if (!job || (job.requestedBy !== person.id && !readsAllNotebooks(person)))
    throw createError({ statusCode: 404, message: 'No such export, or it is not yours.' })
  return job
}

/** The shape the pages read: no parameters blob, times as ISO strings. */
export function exportJobView(job: ExportJob) {
  return {
    id: job.id, status: job.status, total: job.total, done: job.done, error: job.error,
    createdAt: job.createdAt.toISOString(), startedAt: job.startedAt?.toISOString() ?? null, finishedAt: job.finishedAt?.toISOString() ?? null,
    downloadable: job.status === 'done' && job.storageKey !== null,
    /** Finished, but its files were removed after the retention period (expireExportFiles). */
    filesRemoved: job.status === 'done' && job.storageKey === null,
  }
}
