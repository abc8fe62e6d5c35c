import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { ensureRecordsKey } from '../../server/utils/recordsKey'
import { existsSync, mkdirSync, createWriteStream, rmSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import type { TestProject } from 'vitest/node'
import { applyMigrations } from '../../server/database/migrate'
import { seedDemoLab } from '../../server/database/seed'

const root = fileURLToPath(new URL('../..', import.meta.url))
export const TEST_SESSION_PASSWORD = 'test-session-password-that-is-long-enough-0123456789'

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
    /** The owner's connection to the test database (fixtures, tampering tests). */
    databaseURL: string
    /** The app role's connection to the same database: what the server uses. */
    appDatabaseURL: string
    embedHostOrigin: string
    mailDir: string
  }
}

/**
 * A fresh database for this run on the private cluster (or TEST_DATABASE_URL's server), with
 * the owner's URL and the app role's (TEST_APP_DATABASE_URL's role on an outside server).
 */
async function freshDatabase(): Promise<{ owner: string, app: string }> {
  let adminUrl = process.env.TEST_DATABASE_URL
  let appUrl = process.env.TEST_APP_DATABASE_URL
  if (!adminUrl) {
    execFileSync('bash', ['scripts/postgres.sh', 'start'], { cwd: root, stdio: 'inherit' })
    adminUrl = execFileSync('bash', ['scripts/postgres.sh', 'url'], { cwd: root, encoding: 'utf8' }).trim()
    appUrl = execFileSync('bash', ['scripts/postgres.sh', 'url', 'app'], { cwd: root, encoding: 'utf8' }).trim()
  }
  const url = new URL(adminUrl)
  const name = `thermotome_test_${process.pid}`
  const admin = new pg.Client({ connectionString: adminUrl })
  await admin.connect()
  await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
  await admin.query(`CREATE DATABASE ${name}`)
  await admin.end()
  url.pathname = `/${name}`
  const app = new URL(appUrl ?? url.toString())
  app.pathname = `/${name}`
  return { owner: url.toString(), app: app.toString() }
}

async function waitForServer(baseURL: string, child: ChildProcess) {
  const deadline = Date.now() + 60_000
  while (Date.now() < deadline) {
    if (child.exitCode !== null)
      throw new Error(`the test server exited with code ${child.exitCode}; see test-artifacts/server.log`)
    try {
      const response = await fetch(`${baseURL}/api/health`)
      if (response.ok)
        return
    }
    catch { /* not listening yet */ }
    await new Promise(resolve => setTimeout(resolve, 250))
  }
  throw new Error('the test server did not answer within 60 s')
}

/** Starts scripts/mail-catcher.ts on a free loopback port; resolves with its SMTP URL. */
async function startMailCatcher(dataDir: string): Promise<{ url: string, child: ChildProcess }> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/mail-catcher.ts', '--port', '0'], {
    cwd: root,
    env: { ...process.env, THERMOTOME_DATA_DIR: dataDir },
    stdio: ['ignore', 'pipe', 'inherit'],
  })
  const url = await new Promise<string>((resolve, reject) => {
    let output = ''
    const timer = setTimeout(() => reject(new Error('the mail catcher did not start within 30 s')), 30_000)
    child.stdout!.on('data', (chunk: Buffer) => {
      output += chunk.toString()
      const match = /listening on (smtp:\/\/\S+)/.exec(output)
      if (match) {
        clearTimeout(timer)
        resolve(match[1]!)
      }
    })
    child.once('exit', (code) => {
      clearTimeout(timer)
      reject(new Error(`the mail catcher exited with code ${code}`))
    })
  })
  return { url, child }
}

export default async function setup(project: TestProject) {
  mkdirSync(`${root}/test-artifacts`, { recursive: true })
  const { owner: databaseURL, app: appDatabaseURL } = await freshDatabase()
  await applyMigrations(databaseURL)
  await seedDemoLab(databaseURL)

  if (!(process.env.THERMOTOME_REUSE_BUILD === '1' && existsSync(`${root}/.output/server/index.mjs`)))
    execFileSync('npx', ['nuxi', 'build'], { cwd: root, stdio: ['ignore', 'ignore', 'inherit'] })

  const dataDir = `${root}/test-artifacts/data`
  // The server finds it at $THERMOTOME_DATA_DIR/records-key.pem, as npm start does.
  ensureRecordsKey(`${dataDir}/records-key.pem`)
  rmSync(`${dataDir}/mail`, { recursive: true, force: true })
  const mail = await startMailCatcher(dataDir)

  const port = 3300 + (process.pid % 500)
  const baseURL = `http://127.0.0.1:${port}`
  // A host notebook page for the embed tests is served on the next port (another origin).
  const embedHostOrigin = `http://127.0.0.1:${port + 1000}`
  const log = createWriteStream(`${root}/test-artifacts/server.log`)
  const server = spawn(process.execPath, ['.output/server/index.mjs'], {
    cwd: root,
    env: {
      ...process.env,
      HOST: '127.0.0.1',
      PORT: String(port),
      DATABASE_URL: appDatabaseURL,
      NUXT_SESSION_PASSWORD: TEST_SESSION_PASSWORD,
      NUXT_DEMO_MODE: 'true',
      THERMOTOME_TRUST_PROXY: '1',
      THERMOTOME_API_RATE_PER_MINUTE: '30',
      NUXT_PUBLIC_DEMO_MODE: 'true',
      NUXT_PUBLIC_EMBED_ORIGINS: embedHostOrigin,
      THERMOTOME_DATA_DIR: dataDir,
      THERMOTOME_SMTP_URL: mail.url,
      THERMOTOME_MAIL_CATCHER: '1',
      THERMOTOME_PUBLIC_URL: baseURL,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  server.stdout!.pipe(log)
  server.stderr!.pipe(log)
  try {
    await waitForServer(baseURL, server)
  }
  catch (error) {
    mail.child.kill('SIGTERM')
    server.kill('SIGTERM')
    throw error
  }

  project.provide('baseURL', baseURL)
  project.provide('databaseURL', databaseURL)
  project.provide('appDatabaseURL', appDatabaseURL)
  project.provide('embedHostOrigin', embedHostOrigin)
  project.provide('mailDir', `${dataDir}/mail`)

  return async () => {
    server.kill('SIGTERM')
    await new Promise(resolve => server.once('exit', resolve))
    if (mail.child.exitCode === null) {
      mail.child.kill('SIGTERM')
      await new Promise(resolve => mail.child.once('exit', resolve))
    }
  }
}
