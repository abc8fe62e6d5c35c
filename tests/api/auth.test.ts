import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { as, Client, demoPerson } from '../support/http'
import { createPersonWithPassword } from '../support/mail'

// Throttling constants as documented in server/utils/throttle.ts: five free failures.
const FREE_FAILURES = 5

describe('sign-in and sign-out', () => {
  it('signs in with the right password, knows the person and their roles, and signs out', async () => {
    const client = new Client('192.0.2.1')
    const reply = await client.signIn(demoPerson('jonah').email)
    expect(reply.body.person).toMatchObject({ email: demoPerson('jonah').email, roles: ['scientist', 'witness'] })
    const cookieHeader = reply.headers.getSetCookie().join('\n')
    expect(cookieHeader).toMatch(/HttpOnly/i)
    expect(cookieHeader).toMatch(/SameSite=Lax/i)
    // Sessions expire eight hours after sign-in (nuxt.config.ts runtimeConfig.session.maxAge);
    // h3 writes it as the cookie's Expires and refuses older sessions on the server.
    const expires = Date.parse(/Expires=([^;]+)/i.exec(cookieHeader)![1]!)
    expect(Math.abs(expires - (Date.now() + 8 * 3600 * 1000))).toBeLessThan(120_000)
    expect((await client.get('/api/auth/me')).status).toBe(200)
    expect((await client.post('/api/auth/logout')).status).toBe(200)
    expect((await client.get('/api/auth/me')).status).toBe(401)
  })

  it('accepts the e-mail in any letter case', async () => {
    const client = new Client('192.0.2.2')
    const reply = await client.post('/api/auth/login', { email: demoPerson('amara').email.toUpperCase(), password: 'kestrel-ridge-demo' })
    expect(reply.status).toBe(200)
  })

  it('refuses a wrong password with 401 and the same words as an unknown e-mail', async () => {
    const client = new Client('192.0.2.3')
    const wrong = await client.post('/api/auth/login', { email: demoPerson('amara').email, password: 'not the password' })
    const unknown = await client.post('/api/auth/login', { email: 'nobody@kestrel-ridge.example', password: 'not the password' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.message).toBe(unknown.body.message)
    expect((await client.get('/api/auth/me')).status).toBe(401)
  })

  it('names the field for a malformed sign-in body', async () => {
    const reply = await new Client('192.0.2.4').post('/api/auth/login', { email: 'not-an-address' })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^email:/)
    expect(reply.body.data.issues.map((i: { path: string }) => i.path)).toEqual(['email', 'password'])
  })

  it('answers 400, not 500, for a body that is not JSON', async () => {
    const reply = await new Client('192.0.2.5').request('POST', '/api/auth/login', '{"email": ', { 'content-type': 'application/json' })
    expect(reply.status).toBe(400)
  })
})

describe('throttling of failed sign-ins', () => {
  it('answers 429 with the wait time after repeated failures, even for the right password', async () => {
    const client = new Client('192.0.2.50')
    const email = demoPerson('priya').email
    for (let attempt = 1; attempt < FREE_FAILURES; attempt++)
      expect((await client.post('/api/auth/login', { email, password: `wrong ${attempt}` })).status).toBe(401)
    const last = await client.post('/api/auth/login', { email, password: 'wrong again' })
    expect(last.status).toBe(401)
    expect(Number(last.headers.get('retry-after'))).toBeGreaterThan(0)

    const blocked = await client.post('/api/auth/login', { email, password: 'kestrel-ridge-demo' })
    expect(blocked.status).toBe(429)
    expect(blocked.body.message).toMatch(/Try again in \d+ seconds/)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)

    // Another client address is not held up by this one's failures.
    const elsewhere = new Client('192.0.2.51')
    expect((await elsewhere.post('/api/auth/login', { email, password: 'kestrel-ridge-demo' })).status).toBe(200)
  })
})

describe('a disabled person', () => {
  let database: pg.Client
  beforeAll(async () => {
    database = new pg.Client({ connectionString: inject('databaseURL') })
    await database.connect()
  })
  afterAll(async () => { await database.end() })

  it('cannot sign in, loses a live session at once, keeps their records, and it is all audited', async () => {
    const admin = await as('hana')
    const { id, email } = await createPersonWithPassword(admin, ['scientist'], 'a long enough password')

    const person = new Client('192.0.2.60')
    await person.signIn(email, 'a long enough password')
    expect((await person.get('/api/notebooks')).status).toBe(200)

    expect((await admin.patch(`/api/people/${id}`, { disabled: true })).status).toBe(200)
    expect((await person.get('/api/notebooks')).status).toBe(401)
    const again = await new Client('192.0.2.61').post('/api/auth/login', { email, password: 'a long enough password' })
    expect(again.status).toBe(403)
    expect(again.body.message).toMatch(/disabled/)

    const { rows } = await database.query('SELECT action FROM audit_events WHERE subject_id = $1 ORDER BY sequence', [id])
    expect(rows.map(r => r.action)).toEqual(['person_created', 'password_set_by_link', 'sign_in', 'person_disabled', 'sign_in_failed'])
    const stillThere = await database.query('SELECT disabled FROM people WHERE id = $1', [id])
    expect(stillThere.rows[0].disabled).toBe(true)
  })

  it('records role changes as audit events', async () => {
    const admin = await as('hana')
    const people = (await admin.get('/api/people')).body.people as { id: string, email: string }[]
    const felix = people.find(p => p.email === demoPerson('felix').email)!
    expect((await admin.patch(`/api/people/${felix.id}`, { roles: ['compliance', 'witness'] })).status).toBe(200)
    expect((await admin.patch(`/api/people/${felix.id}`, { roles: ['compliance'] })).status).toBe(200)
    const { rows } = await database.query(`SELECT details FROM audit_events WHERE subject_id = $1 AND action = 'roles_changed' ORDER BY sequence`, [felix.id])
    expect(rows.map(r => r.details)).toEqual([
      { from: ['compliance'], to: ['compliance', 'witness'] },
      { from: ['compliance', 'witness'], to: ['compliance'] },
    ])
  })

  it('refuses a password shorter than 12 characters, naming the field', async () => {
    // The person sets it with their link (or when changing it); administrators never do.
    const reply = await new Client('192.0.2.62').post('/api/auth/password-reset', { token: 'a'.repeat(43), password: 'elevenchars' })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^password: at least 12 characters/)
    const amara = await as('amara')
    const change = await amara.post('/api/auth/password', { currentPassword: 'kestrel-ridge-demo', newPassword: 'elevenchars' })
    expect(change.status).toBe(400)
    expect(change.body.message).toMatch(/^newPassword: at least 12 characters/)
  })
})
