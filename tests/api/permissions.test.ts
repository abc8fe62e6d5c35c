import { readdirSync } from 'node:fs'
import { join, relative } from 'node:path'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { as, Client, type DemoKey, type Reply } from '../support/http'
import { uploadFile } from '../support/upload'
import { createSignedRecord } from '../support/signedRecords'
import type { RecordBundle } from '../../shared/records'

/**
 * Every route × (anonymous and each role) with the status it must answer. The demo lab
 * gives one person per role: amara (scientist), priya (witness), felix (compliance),
 * hana (admin). Amara and Priya belong to the infrared notebook; neither Amara nor
 * Felix belongs to the NMR notebook, but Felix reads every notebook as records officer.
 */
// One person per role is enough for the matrix: jonah (scientist and witness) is left out.
type Who = 'anonymous' | Exclude<DemoKey, 'jonah'>
const WHO: Who[] = ['anonymous', 'amara', 'priya', 'felix', 'hana']

const clients = new Map<Who, Client>()
const ids: Record<string, string> = {}
// The members are set back to what they were: other test files rely on the demo notebooks.
let nmrMembers: string[] = []
let serial = 0

beforeAll(async () => {
  clients.set('anonymous', new Client('198.18.0.1'))
  for (const who of WHO.slice(1)) clients.set(who, await as(who as DemoKey))
  const notebooks = (await clients.get('hana')!.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
  ids.infrared = notebooks.find(n => n.name.startsWith('Infrared'))!.id
  ids.nmr = notebooks.find(n => n.name.startsWith('Hyperpolarisation'))!.id
  nmrMembers = (await clients.get('hana')!.get(`/api/notebooks/${ids.nmr}`)).body.members.map((m: { id: string }) => m.id)
  const entries = (await clients.get('amara')!.get(`/api/notebooks/${ids.infrared}/entries?state=draft&sort=title&direction=asc`)).body.entries as { id: string, title: string, author: { name: string } }[]
  // A demo draft by Amara, named exactly: other test files add signed entries to this notebook.
  ids.amaraEntry = entries.find(e => e.author.name.includes('Amara') && e.title === 'Cell B baseline run, week 14')!.id
  const people = (await clients.get('hana')!.get('/api/people')).body.people as { id: string, email: string }[]
  ids.priya = people.find(p => p.email.startsWith('priya'))!.id
  const attached = await uploadFile(clients.get('amara')!, `/api/entries/${ids.amaraEntry}/attachments`, 'permission-check.csv', 'E,g\n0,1\n')
  expect(attached.status).toBe(201)
  ids.attachment = attached.body.attachment.id
  // Signed records: Amara's witnessed by Priya (infrared), Jonah's witnessed by Priya (NMR, not Amara's notebook).
  const own = await createSignedRecord(inject('databaseURL'), { authorEmail: 'amara.lindqvist@kestrel-ridge.example', witnessEmail: 'priya.natarajan@kestrel-ridge.example', notebook: 'Infrared', title: 'Permission check: signed record' })
  const other = await createSignedRecord(inject('databaseURL'), { authorEmail: 'jonah.whitfield@kestrel-ridge.example', witnessEmail: 'priya.natarajan@kestrel-ridge.example', notebook: 'Hyperpolarisation', title: 'Permission check: NMR record' })
  ids.ownRecord = own.entryId
  ids.otherRecord = other.entryId
  bundle = own.bundle
  const started = await clients.get('felix')!.post('/api/exports', { records: [{ entryId: own.entryId, version: 1 }] })
  ids.felixJob = started.body.job.id
  for (let attempt = 0; attempt < 240; attempt++) {
    const { body } = await clients.get('felix')!.get(`/api/exports/${ids.felixJob}`)
    if (body.job.status !== 'queued' && body.job.status !== 'running') break
    await new Promise(resolve => setTimeout(resolve, 250))
  }
})
let bundle: RecordBundle

interface RouteCase {
  name: string
  method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE'
  path: () => string
  body?: (who: Who) => unknown
  /** For bodies that are not JSON (file uploads): sends the request itself. */
  send?: (client: Client, path: string) => Promise<Reply>
  expect: Record<Who, number>
}

const anyoneSignedIn = { anonymous: 401, amara: 200, priya: 200, felix: 200, hana: 200 }
const adminOnly = (ok: number) => ({ anonymous: 401, amara: 403, priya: 403, felix: 403, hana: ok })
const recordsOnly = { anonymous: 401, amara: 403, priya: 403, felix: 200, hana: 200 }

const routes: RouteCase[] = [
  { name: 'health', method: 'GET', path: () => '/api/health', expect: { anonymous: 200, amara: 200, priya: 200, felix: 200, hana: 200 } },
  { name: 'demo sign-in details', method: 'GET', path: () => '/api/demo', expect: { anonymous: 200, amara: 200, priya: 200, felix: 200, hana: 200 } },
  { name: 'who am I', method: 'GET', path: () => '/api/auth/me', expect: anyoneSignedIn },
  { name: 'list notebooks', method: 'GET', path: () => '/api/notebooks', expect: anyoneSignedIn },
  { name: 'create notebook', method: 'POST', path: () => '/api/notebooks', body: who => ({ name: `Permission check ${who} ${serial++} ${Date.now()}` }), expect: adminOnly(201) },
  { name: 'read a notebook one belongs to', method: 'GET', path: () => `/api/notebooks/${ids.infrared}`, expect: anyoneSignedIn },
  { name: 'read a notebook one does not belong to', method: 'GET', path: () => `/api/notebooks/${ids.nmr}`, expect: { anonymous: 401, amara: 404, priya: 200, felix: 200, hana: 200 } },
  { name: 'set notebook members', method: 'PUT', path: () => `/api/notebooks/${ids.nmr}/members`, body: () => ({ memberIds: nmrMembers }), expect: adminOnly(200) },
  { name: 'list entries', method: 'GET', path: () => `/api/notebooks/${ids.infrared}/entries`, expect: anyoneSignedIn },
  { name: 'create entry', method: 'POST', path: () => `/api/notebooks/${ids.infrared}/entries`, body: () => ({ title: 'Permission check' }), expect: { anonymous: 401, amara: 201, priya: 403, felix: 403, hana: 403 } },
  { name: 'read entry', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}`, expect: anyoneSignedIn },
  { name: 'entry history', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}/audit`, expect: anyoneSignedIn },
  { name: 'edit entry', method: 'PATCH', path: () => `/api/entries/${ids.amaraEntry}`, body: () => ({ lockVersion: 1 }), expect: { anonymous: 401, amara: 200, priya: 403, felix: 403, hana: 403 } },
  { name: 'list people', method: 'GET', path: () => '/api/people', expect: adminOnly(200) },
  { name: 'create person', method: 'POST', path: () => '/api/people', body: who => ({ email: `perm.${who}.${serial++}.${Date.now()}@kestrel-ridge.example`, name: 'Permission check', roles: [] }), expect: adminOnly(201) },
  // Identity (issue 14): password links, own password, own tokens, key confirmation.
  { name: 'mail a password link', method: 'POST', path: () => `/api/people/${ids.priya}/password-reset`, expect: adminOnly(202) },
  { name: 'set a password with a link (no session needed)', method: 'POST', path: () => '/api/auth/password-reset', body: () => ({}), expect: { anonymous: 400, amara: 400, priya: 400, felix: 400, hana: 400 } },
  { name: 'change one\'s own password', method: 'POST', path: () => '/api/auth/password', body: () => ({}), expect: { anonymous: 401, amara: 400, priya: 400, felix: 400, hana: 400 } },
  { name: 'signing keys waiting for confirmation', method: 'GET', path: () => '/api/keys/pending', expect: { anonymous: 401, amara: 403, priya: 403, felix: 200, hana: 403 } },
  { name: 'confirm an unknown signing key', method: 'POST', path: () => '/api/keys/00000000-0000-4000-8000-000000000000/confirm', body: () => ({ reason: 'Checked in person at the lab.' }), expect: { anonymous: 401, amara: 403, priya: 403, felix: 404, hana: 403 } },
  { name: 'my API tokens', method: 'GET', path: () => '/api/tokens', expect: anyoneSignedIn },
  { name: 'make my own API token without a body', method: 'POST', path: () => '/api/tokens', body: () => ({}), expect: { anonymous: 401, amara: 400, priya: 400, felix: 400, hana: 400 } },
  { name: 'revoke an unknown own API token', method: 'DELETE', path: () => '/api/tokens/00000000-0000-4000-8000-000000000000', expect: { anonymous: 401, amara: 404, priya: 404, felix: 404, hana: 404 } },
  { name: 'change person', method: 'PATCH', path: () => `/api/people/${ids.priya}`, body: () => ({ name: 'Priya Natarajan' }), expect: adminOnly(200) },
  { name: 'audit trail', method: 'GET', path: () => '/api/audit', expect: recordsOnly },
  { name: 'audit chain check', method: 'GET', path: () => '/api/audit/verify', expect: recordsOnly },
  { name: 'attach a data file', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/attachments`, send: (client, path) => uploadFile(client, path, 'levels.csv', 'E,g\n0,1\n'), expect: { anonymous: 401, amara: 201, priya: 403, felix: 403, hana: 403 } },
  { name: 'list data files', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}/attachments`, expect: anyoneSignedIn },
  { name: 'download a data file', method: 'GET', path: () => `/api/attachments/${ids.attachment}/download`, expect: anyoneSignedIn },
  { name: 'preview a data file', method: 'GET', path: () => `/api/attachments/${ids.attachment}/preview`, expect: anyoneSignedIn },
  { name: 'remove a data file', method: 'DELETE', path: () => `/api/attachments/${ids.attachment}`, expect: { anonymous: 401, amara: 200, priya: 403, felix: 403, hana: 403 } },
  { name: 'search signed records', method: 'GET', path: () => '/api/records', expect: recordsOnly },
  { name: 'PDF of a record one authored or witnessed', method: 'GET', path: () => `/api/records/${ids.ownRecord}/pdf`, expect: anyoneSignedIn },
  // The NMR record was witnessed by Priya, but the members row above empties that notebook:
  // a witness who no longer belongs to it cannot export it either (404, as for Amara).
  // The NMR record: Amara does not belong to that notebook; Priya belongs to it and witnessed the record.
  { name: 'PDF of a record in a notebook one does not belong to', method: 'GET', path: () => `/api/records/${ids.otherRecord}/pdf?version=1`, expect: { anonymous: 401, amara: 404, priya: 200, felix: 200, hana: 200 } },
  { name: 'bundle JSON of a record one authored or witnessed', method: 'GET', path: () => `/api/records/${ids.ownRecord}/export.json?version=1`, expect: anyoneSignedIn },
  { name: 'bundle JSON of a record in a notebook one does not belong to', method: 'GET', path: () => `/api/records/${ids.otherRecord}/export.json`, expect: { anonymous: 401, amara: 404, priya: 200, felix: 200, hana: 200 } },
  { name: 'verify a bundle', method: 'POST', path: () => '/api/verify', body: () => bundle, expect: anyoneSignedIn },
  { name: 'start a bulk export of a record one may export', method: 'POST', path: () => '/api/exports', body: () => ({ records: [{ entryId: ids.ownRecord, version: 1 }] }), expect: { anonymous: 401, amara: 202, priya: 202, felix: 202, hana: 202 } },
  { name: 'start a bulk export including a record one may not read', method: 'POST', path: () => '/api/exports', body: () => ({ records: [{ entryId: ids.otherRecord, version: 1 }] }), expect: { anonymous: 401, amara: 404, priya: 202, felix: 202, hana: 202 } },
  { name: 'list own bulk exports', method: 'GET', path: () => '/api/exports', expect: anyoneSignedIn },
  { name: 'progress of a bulk export', method: 'GET', path: () => `/api/exports/${ids.felixJob}`, expect: { anonymous: 401, amara: 404, priya: 404, felix: 200, hana: 200 } },
  { name: 'download a finished bulk export', method: 'GET', path: () => `/api/exports/${ids.felixJob}/download`, expect: { anonymous: 401, amara: 404, priya: 404, felix: 200, hana: 200 } },
  { name: 'cancel a finished bulk export', method: 'POST', path: () => `/api/exports/${ids.felixJob}/cancel`, expect: { anonymous: 401, amara: 404, priya: 404, felix: 409, hana: 409 } },
  { name: 'audit trail as CSV', method: 'GET', path: () => '/api/audit/export.csv', expect: recordsOnly },
  { name: 'calculation kinds', method: 'GET', path: () => '/api/calculations/kinds', expect: anyoneSignedIn },
  // Signing (issue 5). Bodies that pass the role check but fail validation show the order
  // auth → role → validation without leaving anything behind in the shared test database.
  { name: 'my signing keys', method: 'GET', path: () => '/api/keys', expect: anyoneSignedIn },
  { name: 'register a signing key', method: 'POST', path: () => '/api/keys', body: () => ({}), expect: { anonymous: 401, amara: 400, priya: 400, felix: 403, hana: 403 } },
  { name: 'a person\'s public keys', method: 'GET', path: () => `/api/people/${ids.priya}/keys`, expect: anyoneSignedIn },
  { name: 'signing challenge, witness meaning, on a draft', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/challenge`, body: () => ({ meaning: 'witnessed' }), expect: { anonymous: 401, amara: 403, priya: 409, felix: 403, hana: 403 } },
  { name: 'signing challenge without a meaning', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/challenge`, body: () => ({}), expect: { anonymous: 401, amara: 400, priya: 400, felix: 400, hana: 400 } },
  { name: 'sign an entry', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/sign`, body: () => ({}), expect: { anonymous: 401, amara: 400, priya: 403, felix: 403, hana: 403 } },
  { name: 'request a witness', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/witness-request`, body: () => ({}), expect: { anonymous: 401, amara: 400, priya: 403, felix: 403, hana: 403 } },
  { name: 'countersign', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/countersign`, body: () => ({}), expect: { anonymous: 401, amara: 403, priya: 400, felix: 403, hana: 403 } },
  { name: 'decline to witness', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/decline`, body: () => ({}), expect: { anonymous: 401, amara: 403, priya: 400, felix: 403, hana: 403 } },
  { name: 'amend a draft', method: 'POST', path: () => `/api/entries/${ids.amaraEntry}/amend`, body: () => ({}), expect: { anonymous: 401, amara: 409, priya: 403, felix: 403, hana: 403 } },
  { name: 'signed versions', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}/versions`, expect: anyoneSignedIn },
  { name: 'an unsigned version', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}/versions/1`, expect: { anonymous: 401, amara: 404, priya: 404, felix: 404, hana: 404 } },
  { name: 'witness candidates', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}/witnesses`, expect: anyoneSignedIn },
  { name: 'signing state', method: 'GET', path: () => `/api/entries/${ids.amaraEntry}/signing`, expect: anyoneSignedIn },
  { name: 'verify an unsigned record', method: 'GET', path: () => `/api/records/${ids.amaraEntry}/verify`, expect: { anonymous: 401, amara: 404, priya: 404, felix: 404, hana: 404 } },
  { name: 'bundle of a record one authored or witnessed', method: 'GET', path: () => `/api/records/${ids.ownRecord}/bundle?version=1`, expect: anyoneSignedIn },
  { name: 'bundle of a record in a notebook one does not belong to', method: 'GET', path: () => `/api/records/${ids.otherRecord}/bundle`, expect: { anonymous: 401, amara: 404, priya: 200, felix: 200, hana: 200 } },
  { name: 'bundle of an unsigned record', method: 'GET', path: () => `/api/records/${ids.amaraEntry}/bundle`, expect: { anonymous: 401, amara: 404, priya: 404, felix: 404, hana: 404 } },
  { name: 'caught mail (local mode)', method: 'GET', path: () => '/api/admin/mail', expect: adminOnly(200) },
  { name: 'evaluate a calculation', method: 'POST', path: () => '/api/calculations', body: () => ({ kind: 'levels', input: { temperature: '300 K', levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 2 }] } }), expect: anyoneSignedIn },
  { name: 'list API tokens', method: 'GET', path: () => '/api/admin/tokens', expect: adminOnly(200) },
  { name: 'issue an API token', method: 'POST', path: () => '/api/admin/tokens', body: () => ({ name: 'perm check', actsFor: ids.priya, scopes: ['records:read'] }), expect: adminOnly(201) },
  { name: 'revoke an unknown API token', method: 'DELETE', path: () => '/api/admin/tokens/00000000-0000-4000-8000-000000000000', expect: adminOnly(404) },
  // Bearer-token routes ignore session cookies: without a token everyone gets 401.
  { name: 'v1 notebooks without a token', method: 'GET', path: () => '/api/v1/notebooks', expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 record bundle without a token', method: 'GET', path: () => `/api/v1/records/${ids.amaraEntry}/bundle`, expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 record PDF without a token', method: 'GET', path: () => `/api/v1/records/${ids.amaraEntry}/pdf`, expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 evaluate without a token', method: 'POST', path: () => '/api/v1/calculations', body: () => ({ kind: 'levels', input: {} }), expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 entry without a token', method: 'GET', path: () => `/api/v1/entries/${ids.amaraEntry}`, expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 entries of a notebook without a token', method: 'GET', path: () => `/api/v1/notebooks/${ids.infrared}/entries`, expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 create an entry without a token', method: 'POST', path: () => `/api/v1/notebooks/${ids.infrared}/entries`, body: () => ({ title: 'Permission check' }), expect: { anonymous: 401, amara: 401, priya: 401, felix: 401, hana: 401 } },
  { name: 'v1 OpenAPI description', method: 'GET', path: () => '/api/v1/openapi.json', expect: { anonymous: 200, amara: 200, priya: 200, felix: 200, hana: 200 } },
  { name: 'signed audit checkpoints', method: 'GET', path: () => '/api/audit/checkpoints', expect: recordsOnly },
  { name: 'sign an audit checkpoint now', method: 'POST', path: () => '/api/audit/checkpoints', expect: { anonymous: 401, amara: 403, priya: 403, felix: 201, hana: 403 } },
  { name: 'consistency proof without sizes', method: 'GET', path: () => '/api/audit/consistency', expect: { anonymous: 401, amara: 403, priya: 403, felix: 400, hana: 400 } },
  { name: 'the signed key list', method: 'GET', path: () => '/api/keys/list', expect: anyoneSignedIn },
  // A sign-in without credentials names the fields, signed in or not.
  { name: 'sign in without credentials', method: 'POST', path: () => '/api/auth/login', body: () => ({}), expect: { anonymous: 400, amara: 400, priya: 400, felix: 400, hana: 400 } },
  // Last: signing out ends every session of the person, so no row may come after it.
  { name: 'sign out (everywhere)', method: 'POST', path: () => '/api/auth/logout', expect: { anonymous: 200, amara: 200, priya: 200, felix: 200, hana: 200 } },
]

describe('route permissions', () => {
  for (const route of routes) {
    for (const who of WHO) {
      it(`${route.method} ${route.name} as ${who} → ${route.expect[who]}`, async () => {
        const client = clients.get(who)!
        const reply = route.send
          ? await route.send(client, route.path())
          : await client.request(route.method, route.path(), route.body ? route.body(who) : (route.method === 'GET' || route.method === 'DELETE' ? undefined : {}))
        expect(reply.status, JSON.stringify(reply.body).slice(0, 300)).toBe(route.expect[who])
      })
    }
  }

  it('has a row for every route file under server/api, /api/v1 included', () => {
    // A route without a row has never been tried by anyone but its author: fail until it has one.
    const folder = join(process.cwd(), 'server/api')
    const files = (readdirSync(folder, { recursive: true }) as string[]).filter(file => /\.(get|post|patch|put|delete)\.ts$/.test(file))
    const missing = files.filter((file) => {
      const [, path, method] = /^(.*)\.(get|post|patch|put|delete)\.ts$/.exec(relative(folder, join(folder, file)))!
      const pattern = new RegExp(`^/api/${path!.replace(/\/index$|^index$/, '').replace(/\[[^\]]+\]/g, '[^/]+').replace(/\./g, '\\.')}$`)
      return !routes.some(route => route.method === method!.toUpperCase() && pattern.test(route.path().split('?')[0]!.replace(/\/$/, '')))
    })
    expect(files.length).toBeGreaterThan(60)
    expect(missing, `routes with no row in the permissions table: ${missing.join(', ')}`).toEqual([])
  })

  it('checks the session before the body: anonymous with a bad body gets 401, not 400', async () => {
    const reply = await new Client('198.18.0.2').post('/api/notebooks', { name: 42 })
    expect(reply.status).toBe(401)
  })
})
