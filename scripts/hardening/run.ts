/**
 * npm run test:hardening — load, faults and hostile input against a production build, on a
 * private PostgreSQL cluster (port 54360, test-artifacts/hardening-data). Writes
 * test-artifacts/hardening-report.md. Cleans up (server by pid, cluster by postgres.sh stop)
 * even when a step fails. Env: HARDENING_SECONDS (30), HARDENING_CONNECTIONS (100),
 * HARDENING_FUZZ_RUNS (1000), HARDENING_FUZZ_SEED, HARDENING_ONLY (comma list of
 * load,hostile,fuzz,faults), THERMOTOME_REUSE_BUILD=1 to reuse .output.
 */
import { mkdirSync, writeFileSync } from 'node:fs'
import { cpus, loadavg } from 'node:os'
import { check, checks, counts, skip } from './checks'
import { nextAddress } from './client'
import { AppServer, ARTIFACTS, build, cluster, freePort, prepareDatabase } from './env'
import { databaseOutage, signingKill, uploadsDiskFull, type OutageFigures } from './faults'
import { FUZZ_RUNS, FUZZ_SEED, fuzzRoute, type FuzzOutcome } from './fuzz'
import { LOAD_CONNECTIONS, LOAD_SECONDS, runLoad, type LoadFigures } from './load'
import { callerClient, LEVELS_INPUT, makeFixtures, routePresent, ROUTES, unlistedRoutes } from './routes'
import { bodyLimits, cookies, crossOrigin, markupAsText, npmAudit, securityHeaders } from './web'
import { DEMO_PASSWORD } from '../../shared/demo'
import { demoEmail } from './client'
import { pdfShowsMarkup } from './pdf'

const only = new Set((process.env.HARDENING_ONLY ?? 'load,hostile,fuzz,faults').split(',').map(s => s.trim()))
let server: AppServer | undefined
let cleaned = false
const cleanupSteps: Array<() => Promise<void> | void> = []
export const onCleanup = (step: () => Promise<void> | void) => cleanupSteps.push(step)

async function cleanup() {
  if (cleaned) return
  cleaned = true
  for (const step of cleanupSteps.reverse()) {
    try { await step() } catch (error) { console.error(`cleanup: ${(error as Error).message}`) }
  }
  try { await server?.stop() } catch (error) { console.error(`cleanup (server): ${(error as Error).message}`) }
  try { if (cluster.started) cluster.stop() } catch (error) { console.error(`cleanup (postgres): ${(error as Error).message}`) }
}
for (const signal of ['SIGINT', 'SIGTERM'] as const)
  process.on(signal, () => { void cleanup().then(() => process.exit(130)) })
// An error thrown where nothing awaits it must still stop the server and the cluster.
for (const event of ['uncaughtException', 'unhandledRejection'] as const) {
  process.on(event, (error: unknown) => {
    check('harness', 'no uncaught error', false, (error as Error)?.stack?.split('\n').slice(0, 4).join(' ') ?? String(error))
    void cleanup().then(() => { report(); process.exit(1) })
  })
}

const load: LoadFigures[] = []
const fuzz: FuzzOutcome[] = []
let outage: OutageFigures | undefined
let audit: Awaited<ReturnType<typeof npmAudit>>
let buildNote = ''
const machine = { cores: cpus().length, model: cpus()[0]?.model ?? '', loadBefore: loadavg().map(n => n.toFixed(2)).join(' '), loadAfter: '' }
const startedAt = new Date()

async function main() {
  console.log(`hardening: load ${LOAD_SECONDS} s × ${LOAD_CONNECTIONS} connections, fuzz ${FUZZ_RUNS} bodies per route (seed ${FUZZ_SEED}); machine load ${machine.loadBefore}`)
  const databaseURL = await prepareDatabase()
  buildNote = build()
  server = new AppServer(databaseURL, await freePort())
  await server.start()
  const f = await makeFixtures(server.baseURL)
  f.databaseURL = databaseURL

  const unlisted = unlistedRoutes()
  check('coverage', 'every state-changing route file is in the route table (scripts/hardening/routes.ts)', unlisted.length === 0, unlisted.join(', '))

  if (only.has('load')) {
    const cookie = f.clients.amara.cookie
    const targets = [
      { name: 'entry list', method: 'GET' as const, path: `/api/notebooks/${f.ids.notebook}/entries`, headers: { cookie } },
      { name: 'entry read', method: 'GET' as const, path: `/api/entries/${f.ids.entry}`, headers: { cookie } },
      { name: 'calculation (levels, 3 levels)', method: 'POST' as const, path: '/api/calculations', headers: { cookie }, body: JSON.stringify({ kind: 'levels', input: LEVELS_INPUT }) },
      { name: 'sign-in (right password; scrypt)', method: 'POST' as const, path: '/api/auth/login', body: JSON.stringify({ email: demoEmail('amara'), password: DEMO_PASSWORD }), distinctAddresses: true, deliberate: [429] },
    ]
    for (const target of targets) {
      const figures = await runLoad(f.baseURL, target)
      load.push(figures)
      check('load', `${target.name}: ${figures.rps.toFixed(0)} req/s, p50 ${figures.p50} ms, p99 ${figures.p99} ms`, figures.ok,
        `${figures.requests} requests, status ${JSON.stringify(figures.statusCodes)}, errors ${figures.errors}, timeouts ${figures.timeouts}`)
    }
    check('load', 'the server stayed up through the load runs', server.alive() && server.unexpectedExits().length === 0)
  }

  if (only.has('hostile')) {
    await bodyLimits(f)
    await securityHeaders(f)
    await cookies(f)
    await crossOrigin(f)
    const markupEntry = await markupAsText(f)
    await pdfShowsMarkup(f, markupEntry)
    audit = await npmAudit()
  }

  if (only.has('fuzz')) {
    const health = async () => {
      try { return server!.alive() && (await fetch(`${f.baseURL}/api/health`)).status === 200 }
      catch { return false }
    }
    let offset = 0
    // HARDENING_FUZZ_ROUTES=verify,exports fuzzes only the routes whose file contains one of the words.
    const wanted = (process.env.HARDENING_FUZZ_ROUTES ?? '').split(',').map(w => w.trim()).filter(Boolean)
    for (const row of ROUTES.filter(r => r.body === 'json' && (!wanted.length || wanted.some(w => r.file.includes(w))))) {
      const name = `${row.method} /api/${row.file.replace(/\.(post|patch|put|delete)\.ts$/, '')}`
      if (!routePresent(row)) { skip('fuzz', `${name}: ${FUZZ_RUNS} bodies`, `route not in this build yet (branch ${row.from})`); continue }
      const client = callerClient(f, row.as)
      if (row.as === 'anonymous') client.address = nextAddress()
      const outcome = await fuzzRoute(name, row.method, row.path(f), client, row.valid?.(f) ?? {}, health, offset++)
      fuzz.push(outcome)
      check('fuzz', `${name}: ${outcome.sent} bodies, never a 5xx, healthy after`, outcome.ok,
        `status ${JSON.stringify(outcome.statusCodes)}${outcome.failures.length ? `; first failure: ${JSON.stringify(outcome.failures[0])}` : ''}`)
      if (!(await health())) {
        await server.stop().catch(() => {})
        await server.start()
      }
    }
  }

  if (only.has('faults')) {
    outage = await databaseOutage(f, server)
    await uploadsDiskFull(f, onCleanup)
    await signingKill(f, server)
  }
}

function table(rows: string[][]) {
  return rows.map((r, i) => `| ${r.join(' | ')} |${i === 0 ? `\n|${r.map(() => ' --- ').join('|')}|` : ''}`).join('\n')
}

function report() {
  machine.loadAfter = loadavg().map(n => n.toFixed(2)).join(' ')
  const c = counts()
  const lines = [
    '# Thermotome hardening report',
    '',
    `Run ${startedAt.toISOString()} → ${new Date().toISOString()} by \`npm run test:hardening\` (scripts/hardening/run.ts).`,
    '',
    `Machine: ${machine.cores} cores (${machine.model}), shared with other work at the time: load average ${machine.loadBefore} at the start, ${machine.loadAfter} at the end (1, 5, 15 min). Server: production build (${buildNote}), one Node process on 127.0.0.1, private PostgreSQL on 127.0.0.1:54360, database pool of 10. autocannon runs in the same machine, so it competes with the server for the two cores.`,
    '',
    `**${c.passed} passed, ${c.failed} failed, ${c.skipped} skipped.**`,
    '',
    `## Load (${LOAD_CONNECTIONS} connections, ${LOAD_SECONDS} s each)`,
    '',
    table([['route', 'requests', 'req/s', 'p50 ms', 'p99 ms', 'max ms', 'status codes', 'errors', 'timeouts'],
      ...load.map(l => [`${l.name} — ${l.method} ${l.path.replace(/[0-9a-f-]{36}/g, ':id')}`, String(l.requests), l.rps.toFixed(1), String(l.p50), String(l.p99), String(l.max), JSON.stringify(l.statusCodes), String(l.errors), String(l.timeouts)])]),
    '',
    '## PostgreSQL outage under load',
    '',
    outage
      ? [
          `Entry read under ${outage.load.connections} connections for ${outage.load.seconds} s; \`postgres.sh stop\` at ${(outage.stoppedAt / 1000).toFixed(1)} s, \`start\` returned at ${(outage.startedAt / 1000).toFixed(1)} s.`,
          '',
          `- status codes: ${JSON.stringify(outage.load.statusCodes)}, socket errors ${outage.load.errors}, timeouts ${outage.load.timeouts}; p50 ${outage.load.p50} ms, p99 ${outage.load.p99} ms`,
          `- the 503 message: “${outage.message ?? '(none seen)'}”`,
          `- recovery: first 200 ${outage.firstOkAfterStartMs ?? '—'} ms after \`start\` returned, without restarting the server (probe statuses ${JSON.stringify(outage.probeStatuses)})`,
        ].join('\n')
      : '(not run)',
    '',
    `## Fuzzing (fast-check, ${FUZZ_RUNS} bodies per route, seed ${FUZZ_SEED})`,
    '',
    table([['route', 'bodies', 'status codes', '5xx', 'healthy after'], ...fuzz.map(o => [o.route, String(o.sent), JSON.stringify(o.statusCodes), String(o.failures.length), o.healthyAfter ? 'yes' : 'NO'])]),
    '',
    '## npm audit --omit=dev',
    '',
    audit ? `Counts: ${JSON.stringify(audit.counts)}.${audit.severe.length ? ` High/critical: ${audit.severe.map(s => `${s.name} ${s.severity} (${s.range})`).join('; ')}` : ' No high or critical advisory.'}` : '(not run or the audit endpoint could not be reached; see the checks)',
    '',
    '## Every check',
    '',
    table([['', 'section', 'check', 'detail'], ...checks.map(ch => [ch.status.toUpperCase(), ch.section, ch.name, ch.detail.replace(/\|/g, '\\|').replace(/\n/g, ' ').slice(0, 400)])]),
    '',
  ]
  mkdirSync(ARTIFACTS, { recursive: true })
  writeFileSync(`${ARTIFACTS}/hardening-report.md`, lines.join('\n'))
  writeFileSync(`${ARTIFACTS}/hardening-results.json`, JSON.stringify({ machine, load, outage, fuzz, audit, checks }, null, 2))
  console.log(`report: test-artifacts/hardening-report.md`)
  console.log(`${c.passed} passed, ${c.failed} failed${c.skipped ? `, ${c.skipped} skipped` : ''}`)
  return c.failed
}

// A hard stop so that the run always ends by itself.
const guard = setTimeout(() => {
  check('harness', 'the run finished within its time limit', false, 'stopped after 60 minutes')
  void cleanup().then(() => { report(); process.exit(1) })
}, 60 * 60 * 1000)
guard.unref()

let failedBefore = false
try {
  await main()
}
catch (error) {
  failedBefore = true
  check('harness', 'the harness ran to the end', false, (error as Error).stack?.split('\n').slice(0, 4).join(' ') ?? String(error))
}
finally {
  await cleanup()
}
const failed = report()
process.exit(failed > 0 || failedBefore ? 1 : 0)
