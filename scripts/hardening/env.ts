/**
 * The hardening harness's own world: a private PostgreSQL cluster on port 54360 under
 * test-artifacts/hardening-data (never the shared cluster on 54329), a migrated and seeded
 * database, one production build and the production server started from it.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { createWriteStream, existsSync, mkdirSync, type WriteStream } from 'node:fs'
import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'
import { applyMigrations } from '../../server/database/migrate'
import { seedDemoLab } from '../../server/database/seed'
import { ensureRecordsKey } from '../../server/utils/recordsKey'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))
export const ARTIFACTS = `${ROOT}test-artifacts`
export const DATA_DIR = `${ARTIFACTS}/hardening-data`
export const PG_PORT = '54360'
export const SESSION_PASSWORD = 'hardening-session-password-long-enough-0123456789abcdef'

export const clusterEnv = () => {
  const env: NodeJS.ProcessEnv = { ...process.env, THERMOTOME_DATA_DIR: DATA_DIR, THERMOTOME_PG_PORT: PG_PORT }
  delete env.DATABASE_URL // postgres.sh would otherwise treat the cluster as external
  return env
}

function postgres(command: 'start' | 'stop' | 'url' | 'status'): string {
  return execFileSync('bash', ['scripts/postgres.sh', command], { cwd: ROOT, env: clusterEnv(), encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }).trim()
}

export const cluster = {
  started: false,
  start() { postgres('start'); this.started = true },
  stop() { postgres('stop') },
  url() { return postgres('url') },
}

export async function prepareDatabase(): Promise<string> {
  cluster.start()
  const url = cluster.url()
  if (!url.includes(`:${PG_PORT}/`))
    throw new Error(`refusing to use ${url.replace(/:[^:@]+@/, ':***@')}: not the harness cluster on port ${PG_PORT}`)
  // A fresh database per run, so the figures do not depend on earlier runs.
  const pg = (await import('pg')).default
  const admin = new pg.Client({ connectionString: url.replace(/\/[^/]+$/, '/postgres') })
  await admin.connect()
  await admin.query('DROP DATABASE IF EXISTS thermotome_hardening WITH (FORCE)')
  await admin.query('CREATE DATABASE thermotome_hardening')
  await admin.end()
  const databaseURL = url.replace(/\/[^/]+$/, '/thermotome_hardening')
  await applyMigrations(databaseURL)
  await seedDemoLab(databaseURL)
  return databaseURL
}

export function build() {
  if (process.env.THERMOTOME_REUSE_BUILD === '1' && existsSync(`${ROOT}.output/server/index.mjs`))
    return 'reused .output (THERMOTOME_REUSE_BUILD=1)'
  const started = Date.now()
  execFileSync('npx', ['nuxi', 'build'], { cwd: ROOT, stdio: ['ignore', 'ignore', 'inherit'] })
  return `built with nuxi build in ${((Date.now() - started) / 1000).toFixed(0)} s`
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer()
    probe.unref()
    probe.on('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number }
      probe.close(() => resolve(port))
    })
  })
}

/** The production server, started and stopped by pid; only ever the one this harness started. */
export class AppServer {
  child?: ChildProcess
  baseURL = ''
  log: WriteStream
  exits: Array<{ code: number | null, signal: NodeJS.Signals | null, expected: boolean }> = []
  private expectingExit = false

  constructor(public databaseURL: string, private port: number, private extraEnv: Record<string, string> = {}) {
    mkdirSync(ARTIFACTS, { recursive: true })
    this.log = createWriteStream(`${ARTIFACTS}/hardening-server.log`, { flags: 'a' })
    this.baseURL = `http://127.0.0.1:${port}`
  }

  async start() {
    this.expectingExit = false
    ensureRecordsKey(`${DATA_DIR}/records-key.pem`)
    const child = spawn(process.execPath, ['.output/server/index.mjs'], {
      cwd: ROOT,
      env: {
        ...process.env,
        HOST: '127.0.0.1',
        PORT: String(this.port),
        NODE_ENV: 'production',
        DATABASE_URL: this.databaseURL,
        NUXT_SESSION_PASSWORD: SESSION_PASSWORD,
        NUXT_DEMO_MODE: 'true',
        NUXT_PUBLIC_DEMO_MODE: 'true',
        THERMOTOME_TRUST_PROXY: '1',
        THERMOTOME_DATA_DIR: DATA_DIR,
        // The load and fuzz runs hit /api/v1 far more often than a real integration would.
        THERMOTOME_API_RATE_PER_MINUTE: '100000000',
        ...this.extraEnv,
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    this.child = child
    child.stdout!.pipe(this.log, { end: false })
    child.stderr!.pipe(this.log, { end: false })
    child.on('exit', (code, signal) => { this.exits.push({ code, signal, expected: this.expectingExit }) })
    await this.waitHealthy(60_000)
  }

  alive() { return !!this.child && this.child.exitCode === null && this.child.signalCode === null }

  unexpectedExits() { return this.exits.filter(e => !e.expected) }

  async waitHealthy(timeoutMs: number) {
    const deadline = Date.now() + timeoutMs
    while (Date.now() < deadline) {
      if (this.child && !this.alive())
        throw new Error(`the server exited (${this.child.exitCode ?? this.child.signalCode}); see test-artifacts/hardening-server.log`)
      try {
        const reply = await fetch(`${this.baseURL}/api/health`, { signal: AbortSignal.timeout(2000) })
        if (reply.ok) return
      }
      catch { /* not yet */ }
      await new Promise(r => setTimeout(r, 200))
    }
    throw new Error(`the server did not answer /api/health within ${timeoutMs / 1000} s`)
  }

  /** SIGKILL: the crash-in-the-middle fault. */
  kill() {
    if (!this.alive()) return Promise.resolve()
    this.expectingExit = true
    const exited = new Promise(r => this.child!.once('exit', r))
    process.kill(this.child!.pid!, 'SIGKILL')
    return exited
  }

  async stop() {
    if (!this.alive()) return
    this.expectingExit = true
    const exited = new Promise(r => this.child!.once('exit', r))
    process.kill(this.child!.pid!, 'SIGTERM')
    const timer = setTimeout(() => { if (this.alive()) process.kill(this.child!.pid!, 'SIGKILL') }, 10_000)
    await exited
    clearTimeout(timer)
  }
}
