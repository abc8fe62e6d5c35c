/** Faults: PostgreSQL stopped under load; the server killed while signing; a full uploads disk. */
import { execFile } from 'node:child_process'
import { existsSync, mkdirSync, readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { check, skip } from './checks'
import { Client } from './client'
import { clusterEnv, DATA_DIR, ROOT, type AppServer } from './env'
import { runLoad, LOAD_CONNECTIONS, type LoadFigures } from './load'
import type { Fixtures } from './routes'

const run = promisify(execFile)
const S = 'faults'
export const postgresAsync = (command: 'start' | 'stop') => run('bash', ['scripts/postgres.sh', command], { cwd: ROOT, env: clusterEnv() })
const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))

export interface OutageFigures {
  load: LoadFigures
  stoppedAt: number
  startedAt: number
  first503At?: number
  firstOkAfterStartMs?: number
  message?: string
  probeStatuses: Record<string, number>
}

/** Stop PostgreSQL a third of the way into a load run on the entry read, start it again at two thirds. */
export async function databaseOutage(f: Fixtures, server: AppServer): Promise<OutageFigures | undefined> {
  const seconds = Math.max(15, Number(process.env.HARDENING_OUTAGE_SECONDS ?? 30))
  const path = `/api/entries/${f.ids.entry}`
  const t0 = Date.now()
  const probeStatuses: Record<string, number> = {}
  let message: string | undefined
  let first503At: number | undefined
  let startedAt = 0
  let stoppedAt = 0
  let firstOkAfterStart: number | undefined
  let probing = true
  const probe = (async () => {
    const client = new Client(f.baseURL)
    client.cookie = f.clients.amara.cookie
    while (probing) {
      try {
        const reply = await client.get(path)
        probeStatuses[reply.status] = (probeStatuses[reply.status] ?? 0) + 1
        if (reply.status === 503) {
          first503At ??= Date.now() - t0
          message ??= `${reply.body?.message ?? reply.text.slice(0, 200)} (Retry-After: ${reply.headers.get('retry-after')})`
        }
        if (reply.status === 200 && startedAt && firstOkAfterStart === undefined)
          firstOkAfterStart = Date.now() - t0
      }
      catch (error) {
        probeStatuses.error = (probeStatuses.error ?? 0) + 1
      }
      await sleep(50)
    }
  })()
  let faultError: Error | undefined
  const faults = (async () => {
    await sleep(seconds * 1000 / 3)
    stoppedAt = Date.now() - t0
    await postgresAsync('stop')
    await sleep(seconds * 1000 / 3 - (Date.now() - t0 - stoppedAt))
    await postgresAsync('start')
    startedAt = Date.now() - t0
  })().catch((error: Error) => { faultError = error })
  const load = await runLoad(f.baseURL, { name: 'entry read with PostgreSQL stopped and started', method: 'GET', path, headers: { cookie: f.clients.amara.cookie }, deliberate: [503] }, seconds, LOAD_CONNECTIONS)
  await faults
  if (faultError) {
    probing = false
    await probe
    // Whatever happened, try to leave the cluster running for the rest of the run.
    await postgresAsync('start').catch(() => {})
    check(S, 'PostgreSQL stopped and started under load', false, `postgres.sh failed: ${faultError.message}`)
    return undefined
  }
  // Give recovery up to 20 s more if the load run ended before the first 200.
  const deadline = Date.now() + 20_000
  while (firstOkAfterStart === undefined && Date.now() < deadline) await sleep(100)
  probing = false
  await probe

  const unexpected = Object.keys(load.statusCodes).filter(code => code !== '200' && code !== '503')
  check(S, 'PostgreSQL stopped under load: every answer is 200 or 503, no socket errors or timeouts', unexpected.length === 0 && load.errors === 0 && load.timeouts === 0,
    `status codes ${JSON.stringify(load.statusCodes)}, errors ${load.errors}, timeouts ${load.timeouts}`)
  check(S, 'PostgreSQL stopped: the answer is 503 with a clear message', !!message && /database is not reachable/i.test(message), message ?? 'no 503 seen')
  check(S, 'PostgreSQL stopped: the server process stayed up', server.alive() && server.unexpectedExits().length === 0)
  const recovery = firstOkAfterStart !== undefined ? firstOkAfterStart - startedAt : undefined
  check(S, 'PostgreSQL started again: 200 again without a server restart', recovery !== undefined, recovery !== undefined ? `first 200 ${recovery} ms after postgres.sh start returned` : 'no 200 within 20 s')
  return { load, stoppedAt, startedAt, first503At, firstOkAfterStartMs: recovery, message, probeStatuses }
}

const SIGN_ENTRIES = Number(process.env.HARDENING_SIGN_ENTRIES ?? 16)

interface Stored { id: string, state: string, version: number, versions: number, signatures: number, authored: number, events: number }

async function storedSigning(databaseURL: string, entryIds: string[]): Promise<Stored[]> {
  const pg = (await import('pg')).default
  const db = new pg.Client({ connectionString: databaseURL })
  await db.connect()
  try {
    const { rows } = await db.query(
      `SELECT e.id, e.state, e.version,
              (SELECT count(*) FROM entry_versions v WHERE v.entry_id = e.id)::int AS versions,
              (SELECT count(*) FROM signatures s JOIN entry_versions v ON v.id = s.entry_version_id WHERE v.entry_id = e.id)::int AS signatures,
              (SELECT count(*) FROM signatures s JOIN entry_versions v ON v.id = s.entry_version_id WHERE v.entry_id = e.id AND s.meaning = 'authored')::int AS authored,
              (SELECT count(*) FROM audit_events a WHERE a.subject_id = e.id::text AND a.action = 'entry_signed')::int AS events
         FROM entries e WHERE e.id = ANY($1::uuid[])`, [entryIds])
    return rows
  }
  finally { await db.end() }
}

/** Whole-database invariants: no frozen version without its author's signature, no signed state without a version. */
async function globalSigningInvariants(databaseURL: string) {
  const pg = (await import('pg')).default
  const db = new pg.Client({ connectionString: databaseURL })
  await db.connect()
  try {
    const { rows: [row] } = await db.query(
      `SELECT (SELECT count(*) FROM entry_versions v WHERE NOT EXISTS (SELECT 1 FROM signatures s WHERE s.entry_version_id = v.id AND s.meaning = 'authored'))::int AS versions_without_signature,
              (SELECT count(*) FROM entries e WHERE e.state <> 'draft' AND NOT EXISTS (SELECT 1 FROM entry_versions v WHERE v.entry_id = e.id AND v.version = e.version))::int AS signed_without_version,
              (SELECT count(*) FROM entries e WHERE e.state = 'draft' AND EXISTS (SELECT 1 FROM entry_versions v WHERE v.entry_id = e.id AND v.version = e.version))::int AS draft_with_frozen_version`)
    return row as { versions_without_signature: number, signed_without_version: number, draft_with_frozen_version: number }
  }
  finally { await db.end() }
}

/**
 * Many entries are signed at once and the server is SIGKILLed as soon as the first signature
 * is answered, so that other signings are mid-flight. After a restart: every entry is either a
 * draft with nothing frozen or signed with its version and signature, the whole database holds
 * no half-signed version, verify passes on every signed version, and the interrupted drafts
 * can still be signed.
 */
export async function signingKill(f: Fixtures, server: AppServer) {
  const name = 'server killed in the middle of signing: no half-signed record; verify passes after restart'
  if (!existsSync(join(ROOT, 'server/api/entries/[id]/sign.post.ts'))) {
    skip(S, name, 'signing routes (branch signing) are not in this build yet')
    return undefined
  }
  const records = await import('../../shared/records/index')
  const { DEMO_PASSWORD } = await import('../../shared/demo')
  const amara = f.clients.amara
  const pair = records.generateSigningKeyPair()
  const sealedSecretKey = await records.sealSecretKey(pair.secretKey, 'hardening signing passphrase')
  const current = await amara.get('/api/keys')
  const registered = await amara.post('/api/keys', { publicKey: Buffer.from(pair.publicKey).toString('base64'), sealedSecretKey, password: DEMO_PASSWORD, ...(current.body?.active ? { replaces: 'rotated' } : {}) })
  if (!check(S, 'signing key registered for the kill test', registered.status === 201, `${registered.status} ${registered.text.slice(0, 200)}`))
    return undefined
  // A replacement key signs only once a records officer has confirmed it.
  if (registered.body?.key?.pending)
    await f.clients.felix.post(`/api/keys/${registered.body.key.id}/confirm`, { reason: 'Hardening run: confirmed by the records officer.' })

  const content = { type: 'doc', content: [
    { type: 'paragraph', content: [{ type: 'text', text: 'Signed while the server is killed.' }] },
    { type: 'calculationBlock', attrs: { blockId: '2d3c8f0e-5a8b-4c1e-9f5e-7a6b5c4d3e21', kind: 'levels', title: 'Levels', collapsed: false, input: { temperature: '296 K', levels: [{ energy: '0 cm^-1' }, { energy: '667 cm^-1', degeneracy: 2 }] } } },
  ] }
  const entryIds: string[] = []
  const envelopes: unknown[] = []
  for (let i = 0; i < SIGN_ENTRIES; i++) {
    const created = await amara.post(`/api/notebooks/${f.ids.notebook}/entries`, { title: `Kill-during-signing ${i + 1}`, content })
    if (created.status !== 201) { check(S, name, false, `could not create entry: ${created.status} ${created.text.slice(0, 200)}`); return undefined }
    const id = created.body.entry.id as string
    const challenge = await amara.post(`/api/entries/${id}/challenge`, { meaning: 'authored' })
    if (challenge.status !== 200) { check(S, name, false, `challenge: ${challenge.status} ${challenge.text.slice(0, 200)}`); return undefined }
    const c = challenge.body
    const statement = { schema: 'thermotome.statement/1', recordHash: c.recordHash, signer: c.signer, keyFingerprint: c.keyFingerprint, meaning: 'authored', statement: c.statementText, signedAt: c.issuedAt, challenge: c.nonce }
    entryIds.push(id)
    envelopes.push(await records.signStatement(statement as never, pair.secretKey))
  }

  // Fire every signing at once; SIGKILL the server when the first one is answered.
  const outcomes: Array<number | string> = Array.from({ length: SIGN_ENTRIES }, () => 'pending')
  let killed: Promise<unknown> | undefined
  const killedAfter = Date.now()
  await Promise.all(entryIds.map(async (id, i) => {
    try {
      const reply = await amara.request('POST', `/api/entries/${id}/sign`, { envelope: envelopes[i] }, {}, 20_000)
      outcomes[i] = reply.status
      killed ??= server.kill()
    }
    catch (error) {
      outcomes[i] = `cut off (${(error as Error).cause ? String((error as { cause: { code?: string } }).cause.code ?? 'socket') : (error as Error).message})`
      killed ??= server.kill()
    }
  }))
  await killed
  const killMs = Date.now() - killedAfter
  await server.start()

  const stored = await storedSigning(server.databaseURL, entryIds)
  const half = stored.filter(r => !((r.state === 'draft' && r.versions === 0 && r.signatures === 0 && r.events === 0)
    || (r.state === 'awaiting_witness' && r.versions === 1 && r.signatures === 1 && r.authored === 1 && r.events === 1)))
  const signed = stored.filter(r => r.state === 'awaiting_witness')
  const answered201 = outcomes.filter(o => o === 201).length
  const cut = outcomes.filter(o => typeof o === 'string').length
  const invariants = await globalSigningInvariants(server.databaseURL)
  check(S, 'server killed mid-signing: each entry is wholly signed or wholly a draft (entries, entry_versions, signatures, audit agree)', half.length === 0 && invariants.versions_without_signature === 0 && invariants.signed_without_version === 0 && invariants.draft_with_frozen_version === 0,
    `${SIGN_ENTRIES} signings sent; ${answered201} answered 201 before the kill, ${cut} cut off by it (${killMs} ms); after restart ${signed.length} signed, ${stored.length - signed.length} drafts; half-signed: ${half.length}; whole-database invariants ${JSON.stringify(invariants)}`)
  check(S, 'every signing answered 201 before the kill is stored as signed', outcomes.every((o, i) => o !== 201 || stored.find(r => r.id === entryIds[i])?.state === 'awaiting_witness'))

  // Verify every signed version in the database after the restart.
  const pg = (await import('pg')).default
  const db = new pg.Client({ connectionString: server.databaseURL })
  await db.connect()
  const { rows: versions } = await db.query('SELECT entry_id, version FROM entry_versions ORDER BY frozen_at')
  await db.end()
  const felix = await (await import('./client')).signedIn(f.baseURL, 'felix')
  const failures: string[] = []
  for (const v of versions) {
    const reply = await felix.get(`/api/records/${v.entry_id}/verify?version=${v.version}`)
    if (reply.status !== 200 || reply.body?.ok !== true)
      failures.push(`${v.entry_id} v${v.version}: ${reply.status} ${JSON.stringify(reply.body?.problems ?? reply.text.slice(0, 200))}`)
  }
  check(S, `verify passes on every signed version after the restart (${versions.length})`, failures.length === 0 && versions.length > 0, failures.slice(0, 3).join('; '))

  // The interrupted drafts can still be signed (nothing stuck half-way).
  const drafts = stored.filter(r => r.state === 'draft')
  let resigned = 0
  for (const r of drafts) {
    const challenge = await amara.post(`/api/entries/${r.id}/challenge`, { meaning: 'authored' })
    if (challenge.status !== 200) continue
    const c = challenge.body
    const envelope = await records.signStatement({ schema: 'thermotome.statement/1', recordHash: c.recordHash, signer: c.signer, keyFingerprint: c.keyFingerprint, meaning: 'authored', statement: c.statementText, signedAt: c.issuedAt, challenge: c.nonce } as never, pair.secretKey)
    if ((await amara.post(`/api/entries/${r.id}/sign`, { envelope })).status === 201) resigned++
  }
  check(S, 'the drafts whose signing was cut off can be signed afterwards', resigned === drafts.length, `${resigned} of ${drafts.length}`)
  return { sent: SIGN_ENTRIES, answered201, cut, signedAfter: signed.length, draftsAfter: drafts.length, verified: versions.length - failures.length, killMs }
}

function filesUnder(dir: string): Array<{ path: string, size: number }> {
  if (!existsSync(dir)) return []
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name)
    const info = statSync(full)
    return info.isDirectory() ? filesUnder(full) : [{ path: full, size: info.size }]
  })
}

async function uploadAs(client: Client, path: string, name: string, bytes: Buffer) {
  const form = new FormData()
  form.append('file', new Blob([new Uint8Array(bytes)], { type: 'text/csv' }), name)
  const response = await fetch(`${client.baseURL}${path}`, { method: 'POST', body: form, headers: { 'x-forwarded-for': client.address, cookie: client.cookie }, signal: AbortSignal.timeout(60_000) })
  const text = await response.text()
  let body: any = text
  try { body = JSON.parse(text) } catch { /* not JSON */ }
  return { status: response.status, body, text }
}

/**
 * The uploads folder on a 1 MB tmpfs: a small file fits, a 2 MB one does not. The answer must
 * be a clear error (507, or 503 with a message), no attachments row, no partial file left.
 */
export async function uploadsDiskFull(f: Fixtures, onCleanup: (step: () => Promise<void> | void) => void) {
  const name = 'full uploads disk: clear error, no attachments row, no partial file'
  if (!existsSync(join(ROOT, 'server/api/entries/[id]/attachments.post.ts'))) {
    skip(S, name, 'upload route (branch files) is not in this build yet')
    return undefined
  }
  const uploads = join(DATA_DIR, 'uploads')
  mkdirSync(uploads, { recursive: true })
  let how = 'tmpfs of 1 MB mounted on the uploads folder'
  try {
    await run('mount', ['-t', 'tmpfs', '-o', 'size=1m', 'tmpfs', uploads])
    onCleanup(async () => { await run('umount', [uploads]).catch(() => run('umount', ['-l', uploads])).catch(() => {}) })
  }
  catch (error) {
    skip(S, name, `mount -t tmpfs is not permitted here (${(error as Error).message.slice(0, 120)}); not simulated`)
    return undefined
  }
  try {
    const path = `/api/entries/${f.ids.fuzzEntry}/attachments`
    const row = (n: number) => `${n},${(n * 0.001).toFixed(3)},${'x'.repeat(40)}\n`
    const small = Buffer.from(`index,value,note\n${Array.from({ length: 2000 }, (_, i) => row(i)).join('')}`)
    const large = Buffer.from(`index,value,note\n${Array.from({ length: 40_000 }, (_, i) => row(i)).join('')}`)
    const first = await uploadAs(f.clients.amara, path, 'fits.csv', small)
    check(S, `full disk setup: a ${Math.round(small.length / 1024)} KB file fits on the 1 MB uploads disk`, first.status === 201, `${first.status} ${first.text.slice(0, 200)}`)
    const before = filesUnder(uploads)
    const full = await uploadAs(f.clients.amara, path, 'does-not-fit.csv', large)
    const after = filesUnder(uploads)
    const pg = (await import('pg')).default
    const db = new pg.Client({ connectionString: (f as Fixtures & { databaseURL?: string }).databaseURL })
    await db.connect()
    const { rows } = await db.query(`SELECT count(*)::int AS n FROM attachments WHERE name = 'does-not-fit.csv'`)
    await db.end()
    const message = full.body?.message ?? full.text.slice(0, 200)
    check(S, `full uploads disk (${how}): ${Math.round(large.length / 1024)} KB upload answers 507 or 503 with a clear message`, (full.status === 507 || full.status === 503) && typeof message === 'string' && message.length > 10 && !/internal server error/i.test(message), `${full.status}: ${message}`)
    check(S, 'full uploads disk: no attachments row recorded for the failed upload', rows[0].n === 0, `${rows[0].n} row(s)`)
    check(S, 'full uploads disk: no partial file left in the uploads folder', after.length === before.length, `files before ${before.length}, after ${after.length}: ${after.map(x => `${x.path.slice(uploads.length)} (${x.size} B)`).join(', ')}`)
    return { status: full.status, message, how }
  }
  finally {
    await run('umount', [uploads]).catch(() => run('umount', ['-l', uploads]).catch(() => {}))
  }
}
