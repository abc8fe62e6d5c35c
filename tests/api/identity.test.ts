import { createHash } from 'node:crypto'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { generateSigningKeyPair, keyFingerprint, sealSecretKey, signStatement } from '#shared/records'
import type { SigningStatement } from '#shared/records'
import { as, Client, demoPerson } from '../support/http'
import { createPersonWithPassword, resetTokenIn, waitForMail } from '../support/mail'
import { createSignedRecord } from '../support/signedRecords'

// Issue 14, part 1 and 6: each attack an administrator (or a copied cookie, or a stray body)
// could make, as it must now fail.

let database: pg.Client
let hana: Client
let felix: Client
beforeAll(async () => {
  database = new pg.Client({ connectionString: inject('databaseURL') })
  await database.connect()
  hana = await as('hana')
  felix = await as('felix')
})
afterAll(async () => { await database.end() })

describe('administrators never set passwords', () => {
  it('refuses a password in a change or a new person, naming the field', async () => {
    const people = (await hana.get('/api/people')).body.people as { id: string, email: string }[]
    const amara = people.find(p => p.email === demoPerson('amara').email)!
    const set = await hana.patch(`/api/people/${amara.id}`, { password: 'hana chose this one' })
    expect(set.status).toBe(400)
    expect(set.body.message).toMatch(/^password: administrators never set passwords/)
    // Amara's own password still works; the admin's does not.
    await new Client('192.0.2.90').signIn(demoPerson('amara').email)
    expect((await new Client('192.0.2.91').post('/api/auth/login', { email: demoPerson('amara').email, password: 'hana chose this one' })).status).toBe(401)
    const created = await hana.post('/api/people', { email: 'with.password@kestrel-ridge.example', name: 'With Password', roles: [], password: 'twelve chars ok' })
    expect(created.status).toBe(400)
    expect(created.body.message).toMatch(/^password:/)
  })

  it('mails a one-time, expiring link; only its hash is stored; it works once', async () => {
    const person = await createPersonWithPassword(hana, ['witness'], 'first password chosen')
    await new Client('192.0.2.92').signIn(person.email, 'first password chosen')

    const sent = await hana.post(`/api/people/${person.id}/password-reset`)
    expect(sent.status).toBe(202)
    expect(JSON.stringify(sent.body)).not.toMatch(/token/i)
    const mail = await waitForMail(person.email, /new Thermotome password/)
    const token = resetTokenIn(mail)
    const { rows } = await database.query('SELECT token_hash, expires_at, used_at FROM password_resets WHERE person_id = $1 ORDER BY created_at DESC', [person.id])
    expect(rows[0].token_hash).toBe(createHash('sha256').update(token).digest('hex'))
    expect(JSON.stringify(rows)).not.toContain(token)
    // PASSWORD_RESET_HOURS = 24 (shared/schemas/people.ts).
    expect(Math.abs(new Date(rows[0].expires_at).getTime() - Date.now() - 24 * 3600_000)).toBeLessThan(120_000)

    const short = await new Client('192.0.2.93').post('/api/auth/password-reset', { token, password: 'short' })
    expect(short.status).toBe(400)
    expect(short.body.message).toMatch(/^password:/)
    const used = await new Client('192.0.2.93').post('/api/auth/password-reset', { token, password: 'second password chosen' })
    expect(used.status).toBe(200)
    const again = await new Client('192.0.2.93').post('/api/auth/password-reset', { token, password: 'third password chosen' })
    expect(again.status).toBe(400)
    expect(again.body.message).toMatch(/^token:/)
    await new Client('192.0.2.94').signIn(person.email, 'second password chosen')

    // An expired link is refused (the clock moved on in the database, not in the test).
    await hana.post(`/api/people/${person.id}/password-reset`)
    const late = resetTokenIn(await waitForMail(person.email, /new Thermotome password/, 1))
    await database.query('UPDATE password_resets SET expires_at = now() - interval \'1 minute\' WHERE token_hash = $1', [createHash('sha256').update(late).digest('hex')])
    expect((await new Client('192.0.2.95').post('/api/auth/password-reset', { token: late, password: 'too late password' })).status).toBe(410)

    const actions = (await database.query('SELECT action FROM audit_events WHERE subject_id = $1 ORDER BY sequence', [person.id])).rows.map(r => r.action)
    expect(actions).toEqual(expect.arrayContaining(['person_created', 'password_set_by_link', 'password_reset_sent']))
  })

  it('lets nobody change their own roles', async () => {
    const me = (await hana.get('/api/auth/me')).body.person as { id: string, roles: string[] }
    const grant = await hana.patch(`/api/people/${me.id}`, { roles: [...me.roles, 'compliance'] })
    expect(grant.status).toBe(403)
    expect(grant.body.message).toMatch(/^roles: nobody changes their own roles/)
    expect((await hana.patch(`/api/people/${me.id}`, { roles: ['scientist'] })).status).toBe(403)
    expect((await hana.get('/api/auth/me')).body.person.roles).toEqual(me.roles)
  })
})

describe('sessions end on sign-out and password change', () => {
  it('refuses a cookie copied before sign-out, and every other session of that person', async () => {
    const person = await createPersonWithPassword(hana, ['scientist'])
    const browser = new Client('192.0.2.96')
    await browser.signIn(person.email, person.password)
    const elsewhere = new Client('192.0.2.97')
    await elsewhere.signIn(person.email, person.password)
    const copied = new Client('192.0.2.98')
    copied.cookie = browser.cookie
    expect((await copied.get('/api/auth/me')).status).toBe(200)

    expect((await browser.post('/api/auth/logout')).status).toBe(200)
    expect((await copied.get('/api/auth/me')).status).toBe(401)
    expect((await elsewhere.get('/api/notebooks')).status).toBe(401)
  })

  it('ends every other session when the password changes, and keeps this one', async () => {
    const person = await createPersonWithPassword(hana, ['scientist'])
    const here = new Client('192.0.2.99')
    await here.signIn(person.email, person.password)
    const other = new Client('192.0.2.100')
    await other.signIn(person.email, person.password)
    const wrong = await here.post('/api/auth/password', { currentPassword: 'not my password', newPassword: 'a brand new password' })
    expect(wrong.status).toBe(403)
    expect((await other.get('/api/auth/me')).status).toBe(200)
    const changed = await here.post('/api/auth/password', { currentPassword: person.password, newPassword: 'a brand new password' })
    expect(changed.status).toBe(200)
    expect((await other.get('/api/auth/me')).status).toBe(401)
    expect((await here.get('/api/auth/me')).status).toBe(200)
    await new Client('192.0.2.101').signIn(person.email, 'a brand new password')
  })

  it('ends sessions on a password set by link too', async () => {
    const person = await createPersonWithPassword(hana, ['witness'])
    const open = new Client('192.0.2.102')
    await open.signIn(person.email, person.password)
    await hana.post(`/api/people/${person.id}/password-reset`)
    const token = resetTokenIn(await waitForMail(person.email, /new Thermotome password/))
    expect((await new Client('192.0.2.103').post('/api/auth/password-reset', { token, password: 'set after a reset' })).status).toBe(200)
    expect((await open.get('/api/auth/me')).status).toBe(401)
  })
})

describe('tokens act for a person only with their consent', () => {
  it('lets an admin give someone else records:read only; the person makes write tokens themselves', async () => {
    const person = await createPersonWithPassword(hana, ['scientist'])
    const write = await hana.post('/api/admin/tokens', { name: 'for them', actsFor: person.id, scopes: ['records:read', 'entries:write'] })
    expect(write.status).toBe(403)
    expect(write.body.message).toMatch(/^scopes: entries:write/)
    expect((await hana.post('/api/admin/tokens', { name: 'for them', actsFor: person.id, scopes: ['records:export'] })).status).toBe(403)
    const read = await hana.post('/api/admin/tokens', { name: 'read for them', actsFor: person.id, scopes: ['records:read'] })
    expect(read.status).toBe(201)

    const self = new Client('192.0.2.104')
    await self.signIn(person.email, person.password)
    const own = await self.post('/api/tokens', { name: 'my host system', scopes: ['entries:write', 'records:read'] })
    expect(own.status).toBe(201)
    const mine = (await self.get('/api/tokens')).body.tokens as { id: string, madeByMe: boolean }[]
    expect(mine.map(t => t.madeByMe).sort()).toEqual([false, true])
    const bearer = new Client('192.0.2.105')
    const reply = await bearer.request('GET', '/api/v1/notebooks', undefined, { authorization: `Bearer ${own.body.token}` })
    expect(reply.status).toBe(200)
    // Someone else's token is not mine to revoke; my own is.
    expect((await self.request('DELETE', `/api/tokens/${read.body.id}`)).status).toBe(200)
    expect((await (await as('amara')).request('DELETE', `/api/tokens/${own.body.id}`)).status).toBe(404)
    expect((await self.request('DELETE', `/api/tokens/${own.body.id}`)).status).toBe(200)
  })
})

describe('a replacement signing key signs only after a records officer confirms it', () => {
  it('takes the first key at once; a replacement waits; the officer confirms with a reason; then it signs', async () => {
    const person = await createPersonWithPassword(hana, ['scientist'])
    const scientist = new Client('192.0.2.106')
    await scientist.signIn(person.email, person.password)
    const notebook = await hana.post('/api/notebooks', { name: `Key confirmation ${Date.now()}`, memberIds: [person.id] })
    expect(notebook.status).toBe(201)
    const entry = await scientist.post(`/api/notebooks/${notebook.body.notebook.id}/entries`, { title: 'Signed with a replaced key' })
    expect(entry.status).toBe(201)
    const entryId = entry.body.entry.id as string

    async function register(replaces?: 'rotated' | 'forgotten') {
      const pair = generateSigningKeyPair()
      const sealedSecretKey = await sealSecretKey(pair.secretKey, 'a signing passphrase here')
      const reply = await scientist.post('/api/keys', { publicKey: Buffer.from(pair.publicKey).toString('base64'), sealedSecretKey, password: person.password, ...(replaces ? { replaces } : {}) })
      expect(reply.status, JSON.stringify(reply.body)).toBe(201)
      return { ...reply.body.key, secretKey: pair.secretKey, fingerprint: await keyFingerprint(pair.publicKey) } as { id: string, pending: boolean, secretKey: Uint8Array, fingerprint: string }
    }
    async function sign(key: { secretKey: Uint8Array }) {
      const challenge = await scientist.post(`/api/entries/${entryId}/challenge`, { meaning: 'authored' })
      if (challenge.status !== 200) return challenge
      const statement: SigningStatement = {
        schema: 'thermotome.statement/1', recordHash: challenge.body.recordHash, signer: challenge.body.signer,
        keyFingerprint: challenge.body.keyFingerprint, meaning: 'authored', statement: challenge.body.statementText,
        signedAt: challenge.body.issuedAt, challenge: challenge.body.nonce,
      }
      return scientist.post(`/api/entries/${entryId}/sign`, { envelope: await signStatement(statement, key.secretKey) })
    }

    const first = await register()
    expect(first.pending).toBe(false)
    const replacement = await register('forgotten')
    expect(replacement.pending).toBe(true)
    expect((await scientist.get('/api/keys')).body.keys.find((k: { id: string }) => k.id === replacement.id)).toMatchObject({ pending: true, confirmedAt: null })

    const refused = await sign(replacement)
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/waits for a records officer/)
    expect((await database.query('SELECT count(*)::int AS n FROM entry_versions WHERE entry_id = $1', [entryId])).rows[0].n).toBe(0)

    // Nobody but a records officer confirms, and no officer confirms their own key.
    expect((await (await as('priya')).post(`/api/keys/${replacement.id}/confirm`, { reason: 'I know this person well.' })).status).toBe(403)
    expect((await scientist.post(`/api/keys/${replacement.id}/confirm`, { reason: 'It is my own key, honestly.' })).status).toBe(403)
    const felixId = (await felix.get('/api/auth/me')).body.person.id
    const felixKey = generateSigningKeyPair()
    const { rows: [own] } = await database.query(
      'INSERT INTO signing_keys (person_id, public_key, fingerprint, sealed_secret_key) VALUES ($1, $2, $3, $4) RETURNING id',
      [felixId, Buffer.from(felixKey.publicKey).toString('base64'), await keyFingerprint(felixKey.publicKey), JSON.stringify({ fixture: true })])
    const self = await felix.post(`/api/keys/${own.id}/confirm`, { reason: 'Confirming my own key.' })
    expect(self.status).toBe(403)
    expect(self.body.message).toMatch(/Nobody confirms their own signing key/)
    await database.query('UPDATE signing_keys SET retired_at = now(), retired_reason = $2 WHERE id = $1', [own.id, 'test fixture'])

    expect((await felix.get('/api/keys/pending')).body.keys.map((k: { id: string }) => k.id)).toContain(replacement.id)
    const noReason = await felix.post(`/api/keys/${replacement.id}/confirm`, { reason: 'ok' })
    expect(noReason.status).toBe(400)
    expect(noReason.body.message).toMatch(/^reason:/)
    const confirmed = await felix.post(`/api/keys/${replacement.id}/confirm`, { reason: 'Checked in person at the lab, badge shown.' })
    expect(confirmed.status).toBe(200)
    expect((await felix.post(`/api/keys/${replacement.id}/confirm`, { reason: 'Checked in person at the lab, badge shown.' })).status).toBe(409)
    const { rows: [event] } = await database.query(`SELECT actor_email, details FROM audit_events WHERE action = 'signing_key_confirmed' AND subject_id = $1`, [replacement.id])
    expect(event).toMatchObject({ actor_email: demoPerson('felix').email, details: { reason: 'Checked in person at the lab, badge shown.', fingerprint: replacement.fingerprint } })
    const publicKeys = (await hana.get(`/api/people/${person.id}/keys`)).body.keys as { fingerprint: string, confirmationReason: string | null }[]
    expect(publicKeys.find(k => k.fingerprint === replacement.fingerprint)!.confirmationReason).toBe('Checked in person at the lab, badge shown.')

    const signed = await sign(replacement)
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
  })

  it('the database itself refuses to confirm a key twice or to change who confirmed it', async () => {
    const { rows: [key] } = await database.query('SELECT id FROM signing_keys WHERE confirmed_by IS NOT NULL LIMIT 1')
    await expect(database.query('UPDATE signing_keys SET confirmation_reason = $2 WHERE id = $1', [key.id, 'rewritten'])).rejects.toThrow(/only retiring an active key or confirming a waiting one/)
  })
})

describe('smaller holes', () => {
  it('serves a record bundle only to who may export it, and audits the download', async () => {
    // Amara's record without a witness: Priya belongs to the notebook but neither wrote nor signed it.
    const record = await createSignedRecord(inject('databaseURL'), { authorEmail: demoPerson('amara').email, notebook: 'Infrared', title: 'Bundle export rule' })
    const priya = await as('priya')
    const refused = await priya.get(`/api/records/${record.entryId}/bundle`)
    expect(refused.status).toBe(403)
    expect((await (await as('amara')).get(`/api/records/${record.entryId}/bundle`)).status).toBe(200)
    expect((await felix.get(`/api/records/${record.entryId}/bundle?version=1`)).status).toBe(200)
    const { rows } = await database.query(`SELECT actor_email FROM audit_events WHERE action = 'record_bundle_downloaded' AND subject_id = $1 ORDER BY sequence`, [record.entryId])
    expect(rows.map(r => r.actor_email)).toEqual([demoPerson('amara').email, demoPerson('felix').email])
  })

  it('refuses a body that is not JSON with 415, a NUL in a form body included', async () => {
    const form = await hana.request('POST', '/api/notebooks', 'name=Form%00notebook', { 'content-type': 'application/x-www-form-urlencoded' })
    expect(form.status).toBe(415)
    expect(form.body.message).toMatch(/^body: this route takes JSON/)
    expect((await hana.request('POST', '/api/notebooks', '{"name":"Plain text notebook"}', { 'content-type': 'text/plain' })).status).toBe(415)
    expect((await new Client('192.0.2.107').request('POST', '/api/auth/login', 'email=a%00b&password=x', { 'content-type': 'application/x-www-form-urlencoded' })).status).toBe(415)
    expect((await hana.request('POST', '/api/notebooks', '{"name":"JSON with a charset"}', { 'content-type': 'application/json; charset=utf-8' })).status).toBe(201)
  })

  it('refuses bidirectional overrides and zero-width characters in titles, naming the field', async () => {
    const notebooks = (await hana.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const amara = await as('amara')
    // U+202E reverses what follows on screen: "Cell B ‮txt.exe" style spoofing (CVE-2021-42574).
    const override = await amara.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Cell B \u202Egnitset' })
    expect(override.status).toBe(400)
    expect(override.body.message).toMatch(/^title: contains U\+202E \(right-to-left override\)/)
    const zeroWidth = await hana.post('/api/notebooks', { name: 'Infrared\u200B line surveys' })
    expect(zeroWidth.status).toBe(400)
    expect(zeroWidth.body.message).toMatch(/^name: contains U\+200B \(zero-width space\)/)
    const ordinary = await amara.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Population at 296 K — ν₂ band, naïve check' })
    expect(ordinary.status).toBe(201)
    const rename = await amara.patch(`/api/entries/${ordinary.body.entry.id}`, { lockVersion: ordinary.body.entry.lockVersion, title: 'Renamed \u2066isolate' })
    expect(rename.status).toBe(400)
    expect(rename.body.message).toMatch(/^title: contains U\+2066/)
  })
})
