import { beforeAll, describe, expect, it } from 'vitest'
import { inject } from 'vitest'
import { verifyBundle } from '../../shared/records'
import { evaluate } from '../../shared/thermo'
import { createSignedRecord } from '../support/signedRecords'
import { as, baseURL, Client } from '../support/http'

let admin: Client
let tokenClients = 0
let people: { id: string, email: string }[]
let infraredId: string
const personId = (prefix: string) => people.find(p => p.email.startsWith(prefix))!.id

async function bearer(token: string | null, method: string, path: string, body?: unknown) {
  const headers: Record<string, string> = {}
  if (token) headers.authorization = `Bearer ${token}`
  if (body !== undefined) headers['content-type'] = 'application/json'
  const response = await fetch(`${baseURL()}${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) })
  const text = await response.text()
  let parsed: any = text
  try { parsed = JSON.parse(text) } catch { /* not JSON */ }
  return { status: response.status, body: parsed, headers: response.headers }
}

/**
 * A token for a person: an administrator may issue records:read for someone else; write and
 * export scopes need the person's consent, so the person makes that token themselves.
 */
async function issue(actsFor: string, scopes: string[]) {
  const name = `host ${scopes.join('+')} ${Date.now()}`
  let reply
  if (scopes.every(scope => scope === 'records:read')) {
    reply = await admin.post('/api/admin/tokens', { name, actsFor, scopes })
  }
  else {
    const self = new Client(`198.18.1.${tokenClients++ % 250}`)
    await self.signIn(people.find(p => p.id === actsFor)!.email)
    reply = await self.post('/api/tokens', { name, scopes })
  }
  expect(reply.status).toBe(201)
  expect(reply.body.token).toMatch(/^tmt_/)
  return reply.body as { token: string, id: string }
}

beforeAll(async () => {
  admin = await as('hana')
  people = (await admin.get('/api/people')).body.people
  infraredId = (await admin.get('/api/notebooks')).body.notebooks.find((n: { name: string }) => n.name.startsWith('Infrared')).id
})

describe('API tokens', () => {
  it('are shown once, stored only as a hash, and listed without the secret', async () => {
    const { token, id } = await issue(personId('amara'), ['records:read'])
    const listed = (await admin.get('/api/admin/tokens')).body.tokens.find((t: { id: string }) => t.id === id)
    expect(JSON.stringify(listed)).not.toContain(token)
    expect(token.startsWith(listed.prefix)).toBe(true)
  })

  it('answer 401 when missing, malformed or unknown, 403 when under-scoped', async () => {
    expect((await bearer(null, 'GET', '/api/v1/notebooks')).status).toBe(401)
    expect((await bearer('tmt_not-a-real-token', 'GET', '/api/v1/notebooks')).status).toBe(401)
    const { token } = await issue(personId('amara'), ['records:read'])
    const write = await bearer(token, 'POST', `/api/v1/notebooks/${infraredId}/entries`, { title: 'Not allowed' })
    expect(write.status).toBe(403)
    expect(write.body.message).toMatch(/entries:write/)
    // A session cookie is not a token, and a token is not a session.
    expect((await bearer(token, 'GET', '/api/notebooks')).status).toBe(401)
  })

  it('stop working at once when revoked, and the last use is recorded', async () => {
    const { token, id } = await issue(personId('amara'), ['records:read'])
    expect((await bearer(token, 'GET', '/api/v1/notebooks')).status).toBe(200)
    const listed = (await admin.get('/api/admin/tokens')).body.tokens.find((t: { id: string }) => t.id === id)
    expect(listed.lastUsedAt).not.toBeNull()
    expect((await admin.request('DELETE', `/api/admin/tokens/${id}`)).status).toBe(200)
    const after = await bearer(token, 'GET', '/api/v1/notebooks')
    expect(after.status).toBe(401)
    expect(after.body.message).toMatch(/revoked/)
    expect((await admin.request('DELETE', `/api/admin/tokens/${id}`)).status).toBe(409)
  })

  it('reach only what the person they act for may read', async () => {
    const { token } = await issue(personId('amara'), ['records:read'])
    const names = (await bearer(token, 'GET', '/api/v1/notebooks')).body.notebooks.map((n: { name: string }) => n.name)
    expect(names).toContain('Infrared line surveys — cell B')
    expect(names).not.toContain('Hyperpolarisation bench')
  })

  it('are rate limited: past the limit (30 a minute in the test server) the answer is 429 with Retry-After', async () => {
    const { token } = await issue(personId('amara'), ['records:read'])
    const statuses: number[] = []
    for (let i = 0; i < 31; i++)
      statuses.push((await bearer(token, 'GET', '/api/v1/notebooks')).status)
    expect(statuses.slice(0, 30).every(s => s === 200)).toBe(true)
    const limited = await bearer(token, 'GET', '/api/v1/notebooks')
    expect(limited.status).toBe(429)
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0)
  })

  it('refuse an administrator giving someone else write or export scopes (their consent is needed)', async () => {
    const reply = await admin.post('/api/admin/tokens', { name: 'in their name', actsFor: personId('amara'), scopes: ['records:read', 'records:export'] })
    expect(reply.status).toBe(403)
    expect(reply.body.message).toMatch(/^scopes: records:export/)
  })

  it('name the field of a bad token request', async () => {
    const reply = await admin.post('/api/admin/tokens', { name: 'x', actsFor: personId('amara'), scopes: ['everything'] })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^scopes\[0\]:/)
  })
})

describe('/api/v1 routes', () => {
  it('create an entry with calculation blocks and read it back', async () => {
    const { token } = await issue(personId('amara'), ['records:read', 'entries:write'])
    const input = { temperature: '296 K', levels: [{ energy: '0 cm^-1' }, { energy: '667 cm^-1', degeneracy: 2 }] }
    const created = await bearer(token, 'POST', `/api/v1/notebooks/${infraredId}/entries`, {
      title: 'Imported from the host notebook', text: 'First paragraph.\n\nSecond paragraph.', blocks: [{ kind: 'levels', title: 'Bending levels', input }],
    })
    expect(created.status).toBe(201)
    const id = created.body.entry.id
    const read = await bearer(token, 'GET', `/api/v1/entries/${id}`)
    expect(read.status).toBe(200)
    const nodes = read.body.entry.content.content
    expect(nodes.map((n: { type: string }) => n.type)).toEqual(['paragraph', 'paragraph', 'calculationBlock'])
    expect(nodes[2].attrs).toMatchObject({ kind: 'levels', title: 'Bending levels', input })
    const list = await bearer(token, 'GET', `/api/v1/notebooks/${infraredId}/entries?q=${encodeURIComponent('host notebook')}`)
    expect(list.body.entries.map((e: { id: string }) => e.id)).toContain(id)
  })

  it('refuse an invalid block, naming it and the field, and store nothing', async () => {
    const { token } = await issue(personId('amara'), ['records:read', 'entries:write'])
    const before = (await bearer(token, 'GET', `/api/v1/notebooks/${infraredId}/entries`)).body.total
    const reply = await bearer(token, 'POST', `/api/v1/notebooks/${infraredId}/entries`, {
      title: 'Bad block', blocks: [{ kind: 'levels', input: { temperature: '300 K', levels: [{ energy: '0 cm^-1' }] } }, { kind: 'levels', input: { temperature: '300 kg', levels: [{ energy: '0 cm^-1' }] } }],
    })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^blocks\[1\]\.input\.temperature:/)
    expect((await bearer(token, 'GET', `/api/v1/notebooks/${infraredId}/entries`)).body.total).toBe(before)
  })

  it('evaluate a calculation exactly as the engine does', async () => {
    const { token } = await issue(personId('felix'), ['records:read'])
    const request = { kind: 'spin', input: { nucleus: '1H', field: '9.4 T', temperature: '298.15 K' } }
    const reply = await bearer(token, 'POST', '/api/v1/calculations', request)
    expect(reply.status).toBe(200)
    expect(reply.body.result.polarization).toBeCloseTo((evaluate(request).result as { polarization: number }).polarization, 15)
  })

  it('refuse to write for a person without the scientist role or outside the notebook', async () => {
    const { token } = await issue(personId('felix'), ['entries:write'])
    expect((await bearer(token, 'POST', `/api/v1/notebooks/${infraredId}/entries`, { title: 'No role' })).status).toBe(403)
  })
})

describe('/api/v1 records', () => {
  it('fetch a signed record\'s bundle and PDF with the export scope, and verify the bundle offline', async () => {
    const stored = await createSignedRecord(inject('databaseURL'), {
      authorEmail: 'amara.lindqvist@kestrel-ridge.example', witnessEmail: 'priya.natarajan@kestrel-ridge.example',
      notebook: 'Infrared', title: 'Host system export check', signedAt: '2026-05-04T10:00:00.000Z',
    })
    const entryId = stored.entryId
    const reader = await issue(personId('amara'), ['records:read'])
    expect((await bearer(reader.token, 'GET', `/api/v1/records/${entryId}/bundle`)).status).toBe(403)
    const { token } = await issue(personId('amara'), ['records:export'])
    const bundle = await bearer(token, 'GET', `/api/v1/records/${entryId}/bundle?version=1`)
    expect(bundle.status).toBe(200)
    const report = await verifyBundle(bundle.body)
    expect(report.ok).toBe(true)
    expect(bundle.body.recordHash).toBe(stored.bundle.recordHash)
    const pdf = await fetch(`${baseURL()}/api/v1/records/${entryId}/pdf`, { headers: { authorization: `Bearer ${token}` } })
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toBe('application/pdf')
    expect(new TextDecoder().decode((await pdf.arrayBuffer()).slice(0, 5))).toBe('%PDF-')
    // A token acting for the records officer reaches every record.
    const outsider = await issue(personId('felix'), ['records:export'])
    expect((await bearer(outsider.token, 'GET', `/api/v1/records/${entryId}/bundle`)).status).toBe(200)
    expect((await bearer(token, 'GET', '/api/v1/records/00000000-0000-4000-8000-000000000000/bundle')).status).toBe(404)
    expect((await bearer(token, 'GET', `/api/v1/records/${entryId}/bundle?version=zero`)).status).toBe(400)
  })
})

describe('the OpenAPI description', () => {
  it('is served publicly and describes every /api/v1 route with its scope', async () => {
    const reply = await bearer(null, 'GET', '/api/v1/openapi.json')
    expect(reply.status).toBe(200)
    expect(reply.body.openapi).toBe('3.1.0')
    const paths = Object.keys(reply.body.paths)
    expect(paths).toEqual(expect.arrayContaining(['/api/v1/notebooks', '/api/v1/notebooks/{id}/entries', '/api/v1/entries/{id}', '/api/v1/calculations', '/api/v1/records/{id}/bundle', '/api/v1/records/{id}/pdf']))
    for (const path of paths) {
      for (const operation of Object.values(reply.body.paths[path]) as { 'x-scope': string, responses: Record<string, unknown> }[]) {
        expect(['records:read', 'entries:write', 'records:export']).toContain(operation['x-scope'])
        expect(operation.responses).toHaveProperty('401')
      }
    }
    expect(reply.body.components.schemas.CreateEntry.properties).toHaveProperty('blocks')
  })
})
