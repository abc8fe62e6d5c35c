/**
 * THE route table of the hardening harness: every state-changing route and every route that
 * reads a JSON body, with who calls it, how its ids are found and one valid body. The fuzz,
 * cross-origin and body-limit checks walk this table; `unlistedRoutes()` fails the run when a
 * route file exists under server/api that is not listed here, so new routes cannot slip by.
 * Rows whose file is absent (a branch not merged yet) are reported as skipped, with the reason.
 */
import { existsSync, readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { levelsKind } from '../../shared/thermo/kinds/levels'
import { Client, signedIn, type DemoKey } from './client'
import { ROOT } from './env'

export interface Fixtures {
  baseURL: string
  databaseURL?: string
  clients: Record<DemoKey, Client>
  token: string
  ids: {
    notebook: string // amara's notebook "Infrared line surveys — cell B"
    entry: string // a draft of amara's in it (read by the load run)
    fuzzEntry: string // a draft of amara's that the fuzzer may change
    fuzzNotebook: string // a notebook made for the fuzzer (members may change)
    fuzzPerson: string // a person made for the fuzzer (may be renamed, disabled)
    token: string // an API token id the fuzzer may revoke
    amara: string
    priya: string
  }
}

export type Caller = DemoKey | 'anonymous' | 'token'

export interface RouteRow {
  method: 'POST' | 'PATCH' | 'PUT' | 'DELETE'
  /** Route file under server/api, as Nitro names it. */
  file: string
  path: (f: Fixtures) => string
  as: Caller
  /** 'json' routes read a JSON body (fuzzed); 'none' take no body; 'upload' is multipart. */
  body: 'json' | 'none' | 'upload'
  valid?: (f: Fixtures) => unknown
  /** Which branch brings the route, for the skip message while it is absent. */
  from?: string
  note?: string
  /** Body limit in MB when not the default 1 MB. */
  limitMB?: number
}

/** A valid levels input: the kind's own example (three levels, an amount). */
export const LEVELS_INPUT = levelsKind.exampleInput

const doc = { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Fuzzed.' }] }] }

export const ROUTES: RouteRow[] = [
  { method: 'POST', file: 'auth/login.post.ts', path: () => '/api/auth/login', as: 'anonymous', body: 'json', valid: () => ({ email: 'nobody@kestrel-ridge.example', password: 'wrong password' }) },
  { method: 'POST', file: 'auth/logout.post.ts', path: () => '/api/auth/logout', as: 'anonymous', body: 'none' },
  { method: 'POST', file: 'calculations/index.post.ts', path: () => '/api/calculations', as: 'amara', body: 'json', valid: () => ({ kind: 'levels', input: LEVELS_INPUT }) },
  { method: 'POST', file: 'notebooks/index.post.ts', path: () => '/api/notebooks', as: 'hana', body: 'json', valid: () => ({ name: `Fuzz notebook ${Math.random()}`, description: '', memberIds: [] }) },
  { method: 'PUT', file: 'notebooks/[id]/members.put.ts', path: f => `/api/notebooks/${f.ids.fuzzNotebook}/members`, as: 'hana', body: 'json', valid: f => ({ memberIds: [f.ids.amara] }) },
  { method: 'POST', file: 'notebooks/[id]/entries.post.ts', path: f => `/api/notebooks/${f.ids.notebook}/entries`, as: 'amara', body: 'json', valid: () => ({ title: 'Fuzzed entry', content: doc }) },
  { method: 'PATCH', file: 'entries/[id].patch.ts', path: f => `/api/entries/${f.ids.fuzzEntry}`, as: 'amara', body: 'json', valid: () => ({ lockVersion: 1, title: 'Fuzzed title', content: doc }) },
  { method: 'POST', file: 'people/index.post.ts', path: () => '/api/people', as: 'hana', body: 'json', valid: () => ({ email: `fuzz${Math.floor(Math.random() * 1e9)}@kestrel-ridge.example`, name: 'Fuzz Person', roles: ['witness'] }) },
  { method: 'POST', file: 'people/[id]/password-reset.post.ts', path: f => `/api/people/${f.ids.fuzzPerson}/password-reset`, as: 'hana', body: 'none', note: 'mails a one-time link' },
  { method: 'POST', file: 'auth/password-reset.post.ts', path: () => '/api/auth/password-reset', as: 'anonymous', body: 'json', valid: () => ({ token: 'not-a-token-that-was-ever-issued', password: 'fuzz-password-long' }) },
  { method: 'POST', file: 'auth/password.post.ts', path: () => '/api/auth/password', as: 'jonah', body: 'json', valid: () => ({ currentPassword: 'wrong password', newPassword: 'fuzz-password-long' }), note: 'a wrong current password: the demo password stays' },
  { method: 'POST', file: 'keys/[id]/confirm.post.ts', path: () => '/api/keys/00000000-0000-4000-8000-000000000000/confirm', as: 'felix', body: 'json', valid: () => ({ reason: 'Checked in person at the lab.' }) },
  { method: 'POST', file: 'tokens/index.post.ts', path: () => '/api/tokens', as: 'amara', body: 'json', valid: () => ({ name: 'fuzz own token', scopes: ['records:read'] }) },
  { method: 'DELETE', file: 'tokens/[id].delete.ts', path: () => '/api/tokens/00000000-0000-4000-8000-000000000000', as: 'amara', body: 'none' },
  { method: 'PATCH', file: 'people/[id].patch.ts', path: f => `/api/people/${f.ids.fuzzPerson}`, as: 'hana', body: 'json', valid: () => ({ name: 'Fuzz Person Renamed' }) },
  { method: 'POST', file: 'admin/tokens/index.post.ts', path: () => '/api/admin/tokens', as: 'hana', body: 'json', valid: f => ({ name: 'fuzz token', actsFor: f.ids.amara, scopes: ['records:read'] }) },
  { method: 'DELETE', file: 'admin/tokens/[id].delete.ts', path: f => `/api/admin/tokens/${f.ids.token}`, as: 'hana', body: 'none' },
  { method: 'POST', file: 'v1/calculations.post.ts', path: () => '/api/v1/calculations', as: 'token', body: 'json', valid: () => ({ kind: 'levels', input: LEVELS_INPUT }), note: 'bearer token; exempt from the same-origin check (no cookie)' },
  { method: 'POST', file: 'v1/notebooks/[id]/entries.post.ts', path: f => `/api/v1/notebooks/${f.ids.notebook}/entries`, as: 'token', body: 'json', valid: () => ({ title: 'Fuzzed via API', text: 'Paragraph.', blocks: [{ kind: 'levels', input: LEVELS_INPUT }] }), note: 'bearer token' },
  // Signing (branch signing)
  { method: 'POST', file: 'keys/index.post.ts', path: () => '/api/keys', as: 'amara', body: 'json', from: 'signing', valid: () => ({ publicKey: 'AAAA', sealedSecretKey: {}, password: 'wrong' }) },
  { method: 'POST', file: 'entries/[id]/challenge.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/challenge`, as: 'amara', body: 'json', from: 'signing', valid: () => ({ meaning: 'authored' }) },
  { method: 'POST', file: 'entries/[id]/sign.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/sign`, as: 'amara', body: 'json', from: 'signing', valid: () => ({ envelope: {} }) },
  { method: 'POST', file: 'entries/[id]/witness-request.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/witness-request`, as: 'amara', body: 'json', from: 'signing', valid: f => ({ witnessId: f.ids.priya }) },
  { method: 'POST', file: 'entries/[id]/countersign.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/countersign`, as: 'priya', body: 'json', from: 'signing', valid: () => ({ envelope: {} }) },
  { method: 'POST', file: 'entries/[id]/decline.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/decline`, as: 'priya', body: 'json', from: 'signing', valid: () => ({ reason: 'Not checked yet.' }) },
  { method: 'POST', file: 'entries/[id]/amend.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/amend`, as: 'amara', body: 'json', from: 'signing' },
  // Records, exports and verification (branch pdf)
  { method: 'POST', file: 'exports/index.post.ts', path: () => '/api/exports', as: 'felix', body: 'json', from: 'pdf', valid: f => ({ records: [{ entryId: f.ids.entry, version: 1 }] }) },
  { method: 'POST', file: 'exports/[id]/cancel.post.ts', path: () => '/api/exports/00000000-0000-4000-8000-000000000000/cancel', as: 'felix', body: 'none', from: 'pdf' },
  { method: 'POST', file: 'verify.post.ts', path: () => '/api/verify', as: 'felix', body: 'json', from: 'pdf', valid: () => ({ record: {}, recordHash: '', signatures: [] }), note: 'also takes a PDF or multipart upload', limitMB: 21 },
  // Files (branch files)
  { method: 'POST', file: 'entries/[id]/attachments.post.ts', path: f => `/api/entries/${f.ids.fuzzEntry}/attachments`, as: 'amara', body: 'upload', from: 'files' },
  { method: 'DELETE', file: 'attachments/[id].delete.ts', path: () => '/api/attachments/00000000-0000-4000-8000-000000000000', as: 'amara', body: 'none', from: 'files' },
]

export const routePresent = (row: RouteRow) => existsSync(join(ROOT, 'server/api', row.file))

function walk(dir: string): string[] {
  if (!existsSync(dir)) return []
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name)
    return statSync(full).isDirectory() ? walk(full) : [full]
  })
}

/** State-changing route files (post/patch/put/delete) that the table above does not list. */
export function unlistedRoutes(): string[] {
  const listed = new Set(ROUTES.map(r => r.file))
  return walk(join(ROOT, 'server/api'))
    .map(file => relative(join(ROOT, 'server/api'), file))
    .filter(file => /\.(post|patch|put|delete)\.ts$/.test(file) && !listed.has(file))
}

export async function makeFixtures(baseURL: string): Promise<Fixtures> {
  const keys: DemoKey[] = ['amara', 'jonah', 'priya', 'felix', 'hana']
  const clients = Object.fromEntries(await Promise.all(keys.map(async k => [k, await signedIn(baseURL, k)]))) as Record<DemoKey, Client>
  const { amara, hana } = clients
  const me = async (c: Client) => (await c.get('/api/auth/me')).body
  const amaraId = (await me(amara)).user?.id ?? (await me(amara)).person?.id
  const priyaId = (await me(clients.priya)).user?.id ?? (await me(clients.priya)).person?.id
  const notebooks = (await amara.get('/api/notebooks')).body.notebooks as Array<{ id: string, name: string }>
  const notebook = notebooks.find(n => n.name.startsWith('Infrared'))!
  const list = (await amara.get(`/api/notebooks/${notebook.id}/entries`)).body.entries as Array<{ id: string, title: string }>
  const entry = list.find(e => e.title.startsWith('Cell B baseline'))!
  const fuzzEntry = await amara.post(`/api/notebooks/${notebook.id}/entries`, { title: 'Fuzz target entry' })
  const fuzzNotebook = await hana.post('/api/notebooks', { name: 'Fuzz target notebook', memberIds: [] })
  const fuzzPerson = await hana.post('/api/people', { email: 'fuzz.target@kestrel-ridge.example', name: 'Fuzz Target', roles: ['witness'] })
  const revocable = await hana.post('/api/admin/tokens', { name: 'revocable', actsFor: amaraId, scopes: ['records:read'] })
  // Write and export scopes need the consent of the person the token acts for: Amara makes it.
  const token = await amara.post('/api/tokens', { name: 'hardening', scopes: ['records:read', 'entries:write', 'records:export'] })
  for (const [what, reply] of [['entry', fuzzEntry], ['notebook', fuzzNotebook], ['person', fuzzPerson], ['token', revocable], ['token', token]] as const) {
    if (reply.status !== 201) throw new Error(`fixture ${what}: ${reply.status} ${reply.text.slice(0, 200)}`)
  }
  if (!amaraId || !priyaId || !notebook || !entry) throw new Error('fixtures: demo lab not found')
  return {
    baseURL,
    clients,
    token: token.body.token,
    ids: {
      notebook: notebook.id, entry: entry.id, fuzzEntry: fuzzEntry.body.entry.id, fuzzNotebook: fuzzNotebook.body.notebook.id,
      fuzzPerson: fuzzPerson.body.person.id, token: revocable.body.id, amara: amaraId, priya: priyaId,
    },
  }
}

export function callerClient(f: Fixtures, caller: Caller): Client {
  if (caller === 'anonymous') return new Client(f.baseURL)
  if (caller === 'token') { const c = new Client(f.baseURL); c.bearer = f.token; return c }
  return f.clients[caller]
}
