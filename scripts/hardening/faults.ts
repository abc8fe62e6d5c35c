/** Faults: PostgreSQL stopped under load; the server killed while signing; a full uploads disk. */
import { execFile } from 'node:child_process'
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { check, skip } from './checks'
import { Client } from './client'
import { clusterEnv, ROOT, type AppServer } from './env'
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
  const faults = (async () => {
    await sleep(seconds * 1000 / 3)
    stoppedAt = Date.now() - t0
    await postgresAsync('stop')
    await sleep(seconds * 1000 / 3 - (Date.now() - t0 - stoppedAt))
    await postgresAsync('start')
    startedAt = Date.now() - t0
  })()
  const load = await runLoad(f.baseURL, { name: 'entry read with PostgreSQL stopped and started', method: 'GET', path, headers: { cookie: f.clients.amara.cookie }, deliberate: [503] }, seconds, LOAD_CONNECTIONS)
  await faults
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

export async function signingKill(f: Fixtures, server: AppServer) {
  if (!existsSync(join(ROOT, 'server/api/entries/[id]/sign.post.ts'))) {
    skip(S, 'server killed in the middle of signing: no half-signed record, verify passes after restart', 'signing routes (branch signing) are not in this build yet')
    return
  }
  skip(S, 'server killed in the middle of signing', 'not written yet')
}

export async function uploadsDiskFull(f: Fixtures) {
  if (!existsSync(join(ROOT, 'server/api/entries/[id]/attachments.post.ts'))) {
    skip(S, 'full uploads disk: clear error, no attachment row, no partial file', 'upload route (branch files) is not in this build yet')
    return
  }
  skip(S, 'full uploads disk', 'not written yet')
}
