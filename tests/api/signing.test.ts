import { readdirSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import {
  WrongPassphraseError,
  buildEntryRecord,
  generateSigningKeyPair,
  keyFingerprint,
  openSealedKey,
  recordHash,
  sealSecretKey,
  signStatement,
  verifyBundle,
} from '#shared/records'
import type { SealedKey, SignatureEnvelope, SigningStatement } from '#shared/records'
import { STATEMENT_TEXTS } from '#shared/schemas/signing'
import { DEMO_PASSWORD } from '../../shared/demo'
import { as, baseURL, type Client, type DemoKey } from '../support/http'
import { uploadFile } from '../support/upload'

// The signing journey through the API, with keys made here exactly as the browser makes them
// (shared/records): register, challenge, sign, request a witness, countersign, verify — and
// every misuse the issue lists, each checked to leave nothing stored.

let database: pg.Client
const clients = {} as Record<'amara' | 'jonah' | 'priya' | 'felix' | 'hana', Client>
const keys = {} as Record<'amara' | 'jonah' | 'priya', { secretKey: Uint8Array, fingerprint: string }>
const ids = {} as Record<'infrared' | 'amara' | 'jonah' | 'priya' | 'felix' | 'journey' | 'declined', string>
const PASSPHRASE = 'kestrel ridge signing words'

const levelsInput = { temperature: '296 K', levels: [{ energy: '0 cm^-1' }, { energy: '667 cm^-1', degeneracy: 2 }] }
const content = (temperature = '296 K') => ({
  type: 'doc',
  content: [
    { type: 'paragraph', content: [{ type: 'text', text: 'Hot-band fraction of the bending mode at the cell temperature.' }] },
    { type: 'calculationBlock', attrs: { blockId: '0b5d7a52-4d0e-4a7e-9a55-1f0f3c1d9e01', kind: 'levels', title: 'Bending-mode populations', input: { ...levelsInput, temperature }, collapsed: false } },
  ],
})

async function registerKey(who: 'amara' | 'jonah' | 'priya', replaces?: 'rotated' | 'forgotten') {
  const pair = generateSigningKeyPair()
  const sealedSecretKey = await sealSecretKey(pair.secretKey, PASSPHRASE)
  const publicKey = Buffer.from(pair.publicKey).toString('base64')
  const current = await clients[who].get('/api/keys')
  const reply = await clients[who].post('/api/keys', { publicKey, sealedSecretKey, password: DEMO_PASSWORD, ...(current.body.active || replaces ? { replaces: replaces ?? 'rotated' } : {}) })
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  // A replacement key (fixtures made earlier keys) signs only once a records officer confirms it.
  if (reply.body.key.pending)
    expect((await clients.felix.post(`/api/keys/${reply.body.key.id}/confirm`, { reason: 'Confirmed for the signing tests.' })).status).toBe(200)
  keys[who] = { secretKey: pair.secretKey, fingerprint: await keyFingerprint(pair.publicKey) }
  return reply.body
}

async function newEntry(title: string, document = content()) {
  const reply = await clients.amara.post(`/api/notebooks/${ids.infrared}/entries`, { title, content: document })
  expect(reply.status).toBe(201)
  return reply.body.entry.id as string
}

async function challengeFor(client: Client, entryId: string, meaning: 'authored' | 'witnessed') {
  const reply = await client.post(`/api/entries/${entryId}/challenge`, { meaning })
  expect(reply.status, JSON.stringify(reply.body)).toBe(200)
  return reply.body as { record: any, recordHash: string, nonce: string, issuedAt: string, expiresAt: string, signer: SigningStatement['signer'], keyFingerprint: string, statementText: string, countersigns?: string, version: number }
}

async function envelopeFor(client: Client, who: 'amara' | 'jonah' | 'priya', entryId: string, meaning: 'authored' | 'witnessed', change: (s: SigningStatement) => SigningStatement = s => s) {
  const challenge = await challengeFor(client, entryId, meaning)
  const statement: SigningStatement = change({
    schema: 'thermotome.statement/1',
    recordHash: challenge.recordHash,
    signer: challenge.signer,
    keyFingerprint: challenge.keyFingerprint,
    meaning,
    statement: challenge.statementText,
    signedAt: challenge.issuedAt,
    challenge: challenge.nonce,
    ...(challenge.countersigns ? { countersigns: challenge.countersigns } : {}),
  })
  return { challenge, envelope: await signStatement(statement, keys[who].secretKey) }
}

async function storedCounts(entryId: string) {
  const { rows: [row] } = await database.query(
    `SELECT (SELECT count(*) FROM entry_versions WHERE entry_id = $1)::int AS versions,
            (SELECT count(*) FROM signatures s JOIN entry_versions v ON v.id = s.entry_version_id WHERE v.entry_id = $1)::int AS signatures,
            (SELECT count(*) FROM audit_events WHERE subject_id = $1::text AND action IN ('entry_signed','entry_witnessed','entry_declined'))::int AS events`, [entryId])
  // The state is derived, never stored: as the server reports it.
  return { ...row, state: (await clients.felix.get(`/api/entries/${entryId}`)).body.entry.state }
}

function caughtMail(recipient: string): { to: string[], subject: string, text: string }[] {
  const folder = inject('mailDir')
  let names: string[] = []
  try { names = readdirSync(folder).filter(name => name.endsWith('.json')) }
  catch { return [] }
  return names.map(name => JSON.parse(readFileSync(join(folder, name), 'utf8'))).filter(message => message.to.includes(recipient))
}

async function waitForMail(recipient: string, match: RegExp) {
  for (let attempt = 0; attempt < 40; attempt++) {
    const found = caughtMail(recipient).find(message => match.test(message.subject))
    if (found) return found
    await new Promise(resolve => setTimeout(resolve, 100))
  }
  throw new Error(`no mail to ${recipient} matching ${match}`)
}

beforeAll(async () => {
  database = new pg.Client({ connectionString: inject('databaseURL') })
  await database.connect()
  for (const who of ['amara', 'jonah', 'priya', 'felix', 'hana'] as DemoKey[])
    clients[who as keyof typeof clients] = await as(who)
  const notebooks = (await clients.hana.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
  ids.infrared = notebooks.find(n => n.name.startsWith('Infrared'))!.id
  const people = (await clients.hana.get('/api/people')).body.people as { id: string, email: string }[]
  for (const who of ['amara', 'jonah', 'priya', 'felix'] as const)
    ids[who] = people.find(p => p.email.startsWith(who))!.id
  await registerKey('amara')
  await registerKey('jonah')
  await registerKey('priya')
}, 180_000)
afterAll(async () => { await database?.end() })

describe('signing keys', () => {
  it('keeps the public key and the sealed secret; the sealed secret opens only with the passphrase', async () => {
    const mine = await clients.amara.get('/api/keys')
    expect(mine.status).toBe(200)
    const active = mine.body.keys.find((key: { id: string }) => key.id === mine.body.active)
    expect(active.fingerprint).toBe(keys.amara.fingerprint)
    const opened = await openSealedKey(active.sealedSecretKey as SealedKey, PASSPHRASE)
    expect(Buffer.from(opened).equals(Buffer.from(keys.amara.secretKey))).toBe(true)
    // A wrong passphrase fails in the browser's code before anything could be signed or sent.
    await expect(openSealedKey(active.sealedSecretKey as SealedKey, 'not the passphrase')).rejects.toBeInstanceOf(WrongPassphraseError)
    const listed = await clients.felix.get(`/api/people/${ids.amara}/keys`)
    expect(listed.status).toBe(200)
    expect(listed.body.keys[0].fingerprint).toBe(keys.amara.fingerprint)
    expect(JSON.stringify(listed.body)).not.toContain('sealed')
  }, 60_000)

  it('refuses a second key without a reason, a wrong account password, a bad public key, and people who never sign', async () => {
    const pair = generateSigningKeyPair()
    const before = (await clients.amara.get('/api/keys')).body.keys as { sealedSecretKey: unknown }[]
    const sealedSecretKey = before[0]!.sealedSecretKey as SealedKey
    const publicKey = Buffer.from(pair.publicKey).toString('base64')
    const noReason = await clients.amara.post('/api/keys', { publicKey, sealedSecretKey, password: DEMO_PASSWORD })
    expect(noReason.status).toBe(400)
    expect(noReason.body.message).toMatch(/^replaces:/)
    const wrongPassword = await clients.amara.post('/api/keys', { publicKey, sealedSecretKey, password: 'wrong password!', replaces: 'rotated' })
    expect(wrongPassword.status).toBe(403)
    const badKey = await clients.amara.post('/api/keys', { publicKey: 'AAAA', sealedSecretKey, password: DEMO_PASSWORD, replaces: 'rotated' })
    expect(badKey.status).toBe(400)
    expect(badKey.body.message).toMatch(/^publicKey:/)
    const weakSeal = await clients.amara.post('/api/keys', { publicKey, sealedSecretKey: { ...sealedSecretKey, iterations: 1000 }, password: DEMO_PASSWORD, replaces: 'rotated' })
    expect(weakSeal.status).toBe(400)
    expect(weakSeal.body.message).toMatch(/^sealedSecretKey\.iterations:/)
    expect((await clients.hana.post('/api/keys', { publicKey, sealedSecretKey, password: DEMO_PASSWORD })).status).toBe(403)
    const after = await clients.amara.get('/api/keys')
    expect(after.body.keys).toHaveLength(before.length)
  })
})

describe('author signature, witness countersignature, verification', () => {
  it('the browser rebuilds the same record hash as the server from what the page shows', async () => {
    ids.journey = await newEntry('Hot-band fraction at 296 K')
    const upload = await uploadFile(clients.amara, `/api/entries/${ids.journey}/attachments`, 'bending-band.csv', 'wavenumber,intensity\n667.4,0.82\n', 'text/csv')
    expect(upload.status, JSON.stringify(upload.body)).toBe(201)
    const challenge = await challengeFor(clients.amara, ids.journey, 'authored')
    expect(challenge.record.attachments.map((a: { name: string }) => a.name)).toEqual(['bending-band.csv'])
    const shown = (await clients.amara.get(`/api/entries/${ids.journey}`)).body
    const rebuilt = buildEntryRecord({ entry: shown.entry, notebook: shown.notebook, attachments: challenge.record.attachments })
    expect(await recordHash(rebuilt)).toBe(challenge.recordHash)
    expect(challenge.statementText).toBe(STATEMENT_TEXTS.authored)
    expect(Date.parse(challenge.expiresAt) - Date.parse(challenge.issuedAt)).toBe(5 * 60_000)
    // The server computed the block itself; a two-level system at 296 K with a 667 cm^-1 gap and
    // g = 2 has an upper fraction 2e^{-x}/(1+2e^{-x}), x = hc·667 cm^-1/kT (CODATA 2018 constants).
    const x = (6.62607015e-34 * 299792458 * 66700) / (1.380649e-23 * 296)
    const upper = 2 * Math.exp(-x) / (1 + 2 * Math.exp(-x))
    const populations = JSON.stringify(challenge.record.calculations[0].result)
    expect(populations).toContain(String(upper).slice(0, 6))
  })

  it('refuses every malformed or misused signature and stores nothing', async () => {
    const before = await storedCounts(ids.journey)
    const post = (envelope: unknown) => clients.amara.post(`/api/entries/${ids.journey}/sign`, { envelope })

    const { envelope } = await envelopeFor(clients.amara, 'amara', ids.journey, 'authored')
    const malformedSignature = await post({ ...envelope, signature: 'abc' })
    expect(malformedSignature.status).toBe(400)
    expect(malformedSignature.body.message).toMatch(/^envelope\.signature:/)

    const { signer: _signer, ...withoutSigner } = envelope.statement
    const malformedStatement = await post({ ...envelope, statement: withoutSigner })
    expect(malformedStatement.status).toBe(400)
    expect(malformedStatement.body.message).toMatch(/^envelope\.statement\.signer:/)

    const wrongText = await envelopeFor(clients.amara, 'amara', ids.journey, 'authored', s => ({ ...s, statement: 'I sign whatever.' }))
    const wrongTextReply = await post(wrongText.envelope)
    expect(wrongTextReply.status).toBe(400)
    expect(wrongTextReply.body.message).toMatch(/^envelope\.statement\.statement:/)

    // Another key: a fresh pair the server does not know signs a statement naming itself.
    const stranger = generateSigningKeyPair()
    const strangerEnvelope = await signStatement({ ...envelope.statement, keyFingerprint: await keyFingerprint(stranger.publicKey) }, stranger.secretKey)
    const strangerReply = await post(strangerEnvelope)
    expect(strangerReply.status).toBe(403)
    // Another key claiming to be Amara's: the signature does not verify under her key.
    const impostor: SignatureEnvelope = { ...strangerEnvelope, statement: envelope.statement, publicKey: envelope.publicKey }
    const impostorReply = await post(impostor)
    expect(impostorReply.status).toBe(400)
    expect(impostorReply.body.message).toMatch(/^envelope\.signature: does not verify/)
    // Jonah's key used in Amara's name.
    const jonahsKey = await signStatement({ ...envelope.statement, keyFingerprint: keys.jonah.fingerprint }, keys.jonah.secretKey)
    expect((await post(jonahsKey)).status).toBe(403)

    // Signed as someone else.
    const asJonah = await signStatement({ ...envelope.statement, signer: { id: ids.jonah, name: 'Dr Jonah Whitfield', email: 'jonah.whitfield@kestrel-ridge.example' } }, keys.amara.secretKey)
    expect((await post(asJonah)).status).toBe(403)

    // Back-dated: the statement's time is not the challenge's.
    const backdated = await envelopeFor(clients.amara, 'amara', ids.journey, 'authored', s => ({ ...s, signedAt: '2020-01-01T00:00:00.000Z' }))
    const backdatedReply = await post(backdated.envelope)
    expect(backdatedReply.status).toBe(400)
    expect(backdatedReply.body.message).toMatch(/^envelope\.statement\.signedAt:/)

    // A made-up challenge.
    const madeUp = await signStatement({ ...envelope.statement, challenge: 'not-a-challenge' }, keys.amara.secretKey)
    const madeUpReply = await post(madeUp)
    expect(madeUpReply.status).toBe(400)
    expect(madeUpReply.body.message).toMatch(/^envelope\.statement\.challenge:/)

    // An expired challenge: 410 Gone.
    const late = await envelopeFor(clients.amara, 'amara', ids.journey, 'authored')
    await database.query(`UPDATE signing_challenges SET expires_at = now() - interval '1 second' WHERE nonce = $1`, [late.challenge.nonce])
    expect((await post(late.envelope)).status).toBe(410)

    // A person without the scientist role, and the author asking to witness their own entry.
    expect((await clients.priya.post(`/api/entries/${ids.journey}/sign`, { envelope })).status).toBe(403)
    expect((await clients.felix.post(`/api/entries/${ids.journey}/challenge`, { meaning: 'authored' })).status).toBe(403)

    // The entry changed after the challenge: no longer the version that was offered.
    const stale = await envelopeFor(clients.amara, 'amara', ids.journey, 'authored')
    const lockVersion = (await clients.amara.get(`/api/entries/${ids.journey}`)).body.entry.lockVersion
    expect((await clients.amara.patch(`/api/entries/${ids.journey}`, { lockVersion, content: content('297 K') })).status).toBe(200)
    const staleReply = await post(stale.envelope)
    expect(staleReply.status).toBe(409)
    expect(await storedCounts(ids.journey)).toEqual(before)
  }, 120_000)

  it('signs: freezes the version, stores the signature, awaits a witness; a replay is refused', async () => {
    const { envelope } = await envelopeFor(clients.amara, 'amara', ids.journey, 'authored')
    const reply = await clients.amara.post(`/api/entries/${ids.journey}/sign`, { envelope })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    expect(reply.body.entry.state).toBe('awaiting_witness')
    expect(reply.body.version.recordHash).toBe(envelope.statement.recordHash)
    const after = await storedCounts(ids.journey)
    expect(after).toMatchObject({ versions: 1, signatures: 1, events: 1, state: 'awaiting_witness' })

    const replay = await clients.amara.post(`/api/entries/${ids.journey}/sign`, { envelope })
    expect(replay.status).toBe(409)
    expect(await storedCounts(ids.journey)).toEqual(after)
    // The signed draft cannot be edited any more.
    expect((await clients.amara.patch(`/api/entries/${ids.journey}`, { lockVersion: reply.body.entry.lockVersion, title: 'Changed' })).status).toBe(409)
  })

  it('the database refuses UPDATE and DELETE of a signed version and its signature', async () => {
    await expect(database.query(`UPDATE entry_versions SET title = 'forged' WHERE entry_id = $1`, [ids.journey])).rejects.toThrow(/refuse|not allowed|frozen|append-only/i)
    await expect(database.query(`DELETE FROM signatures WHERE entry_version_id IN (SELECT id FROM entry_versions WHERE entry_id = $1)`, [ids.journey])).rejects.toThrow(/refuse|not allowed|frozen|append-only/i)
    await expect(database.query(`UPDATE signing_keys SET public_key = 'x' WHERE fingerprint = $1`, [keys.amara.fingerprint])).rejects.toThrow(/only retiring/)
  })

  it('asks a witness: refuses the author and people who cannot witness, e-mails the chosen witness a link', async () => {
    const ask = (witnessId: string, client = clients.amara) => client.post(`/api/entries/${ids.journey}/witness-request`, { witnessId })
    expect((await ask(ids.amara)).status).toBe(403)
    const felix = await ask(ids.felix)
    expect(felix.status).toBe(400)
    expect(felix.body.message).toMatch(/^witnessId: .*witness role/)
    expect((await ask('not-an-id')).body.message).toMatch(/^witnessId:/)
    expect((await ask(ids.priya, clients.jonah)).status).toBe(403)

    const candidates = await clients.amara.get(`/api/entries/${ids.journey}/witnesses`)
    expect(candidates.body.witnesses.map((w: { id: string }) => w.id).sort()).toEqual([ids.jonah, ids.priya].sort())

    const asked = await ask(ids.priya)
    expect(asked.status, JSON.stringify(asked.body)).toBe(201)
    expect(asked.body.mailed).toBe(true)
    expect((await ask(ids.priya)).status).toBe(409)
    const mail = await waitForMail('priya.natarajan@kestrel-ridge.example', /Witness request: Hot-band fraction at 296 K/)
    expect(mail.to).toEqual(['priya.natarajan@kestrel-ridge.example'])
    expect(mail.text).toContain(`${baseURL()}/entries/${ids.journey}`)
  })

  it('refuses a countersignature from the author, from a witness not asked, and one naming another statement', async () => {
    const before = await storedCounts(ids.journey)
    // Amara is no witness; Jonah is a witness in this notebook but was not asked.
    expect((await clients.amara.post(`/api/entries/${ids.journey}/challenge`, { meaning: 'witnessed' })).status).toBe(403)
    expect((await clients.jonah.post(`/api/entries/${ids.journey}/challenge`, { meaning: 'witnessed' })).status).toBe(403)
    const wrongReference = await envelopeFor(clients.priya, 'priya', ids.journey, 'witnessed', s => ({ ...s, countersigns: 'f'.repeat(64) }))
    const reply = await clients.priya.post(`/api/entries/${ids.journey}/countersign`, { envelope: wrongReference.envelope })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^envelope\.statement\.countersigns:/)
    const authoredAsWitness = await envelopeFor(clients.priya, 'priya', ids.journey, 'witnessed', s => ({ ...s, meaning: 'authored' }))
    expect((await clients.priya.post(`/api/entries/${ids.journey}/countersign`, { envelope: authoredAsWitness.envelope })).body.message).toMatch(/^envelope\.statement\.meaning:/)
    expect(await storedCounts(ids.journey)).toEqual(before)
  })

  it('the witness countersigns and verify reports both signatures valid; the bundle verifies offline', async () => {
    const { challenge, envelope } = await envelopeFor(clients.priya, 'priya', ids.journey, 'witnessed')
    expect(challenge.statementText).toBe(STATEMENT_TEXTS.witnessed)
    const reply = await clients.priya.post(`/api/entries/${ids.journey}/countersign`, { envelope })
    expect(reply.status, JSON.stringify(reply.body)).toBe(201)
    expect(reply.body.entry.state).toBe('witnessed')

    const verified = await clients.felix.get(`/api/records/${ids.journey}/verify`)
    expect(verified.status).toBe(200)
    expect(verified.body.problems).toEqual([])
    expect(verified.body.ok).toBe(true)
    expect(verified.body.signatures.map((s: { meaning: string, ok: boolean }) => [s.meaning, s.ok])).toEqual([['authored', true], ['witnessed', true]])
    expect(verified.body.auditChain.ok).toBe(true)

    const bundle = await clients.felix.get(`/api/records/${ids.journey}/bundle`)
    expect(bundle.status).toBe(200)
    const offline = await verifyBundle(bundle.body)
    expect(offline.problems).toEqual([])
    expect(offline.ok).toBe(true)
  }, 60_000)

  it('a rotated key is retired but still verifies what it signed; the retired key signs nothing new', async () => {
    const oldKey = keys.amara
    await registerKey('amara', 'rotated')
    const mine = (await clients.amara.get('/api/keys')).body.keys as { fingerprint: string, retiredAt: string | null, retiredReason: string | null }[]
    expect(mine.find(k => k.fingerprint === oldKey.fingerprint)).toMatchObject({ retiredReason: 'rotated' })
    expect(mine.filter(k => k.retiredAt === null)).toHaveLength(1)
    expect((await clients.felix.get(`/api/records/${ids.journey}/verify`)).body.ok).toBe(true)

    const entryId = await newEntry('Signed with a retired key')
    const { envelope } = await envelopeFor(clients.amara, 'amara', entryId, 'authored')
    const retired = await signStatement({ ...envelope.statement, keyFingerprint: oldKey.fingerprint }, oldKey.secretKey)
    const reply = await clients.amara.post(`/api/entries/${entryId}/sign`, { envelope: retired })
    expect(reply.status).toBe(403)
    expect(reply.body.message).toMatch(/retired/)
  }, 60_000)
})

describe('two witnesses, declining, amending', () => {
  it('two witnesses countersigning at the same moment: exactly one succeeds, the other gets 409', async () => {
    const entryId = await newEntry('Parallel witnesses')
    const { envelope } = await envelopeFor(clients.amara, 'amara', entryId, 'authored')
    expect((await clients.amara.post(`/api/entries/${entryId}/sign`, { envelope })).status).toBe(201)
    for (const witness of [ids.jonah, ids.priya])
      expect((await clients.amara.post(`/api/entries/${entryId}/witness-request`, { witnessId: witness })).status).toBe(201)
    const jonah = await envelopeFor(clients.jonah, 'jonah', entryId, 'witnessed')
    const priya = await envelopeFor(clients.priya, 'priya', entryId, 'witnessed')
    const replies = await Promise.all([
      clients.jonah.post(`/api/entries/${entryId}/countersign`, { envelope: jonah.envelope }),
      clients.priya.post(`/api/entries/${entryId}/countersign`, { envelope: priya.envelope }),
    ])
    expect(replies.map(r => r.status).sort()).toEqual([201, 409])
    expect(await storedCounts(entryId)).toMatchObject({ versions: 1, signatures: 2, state: 'witnessed' })
    expect((await clients.felix.get(`/api/records/${entryId}/verify`)).body.ok).toBe(true)
  }, 60_000)

  it('a witness declines with a reason; the author is e-mailed the reason', async () => {
    ids.declined = await newEntry('Declined then amended')
    const { envelope } = await envelopeFor(clients.amara, 'amara', ids.declined, 'authored')
    expect((await clients.amara.post(`/api/entries/${ids.declined}/sign`, { envelope })).status).toBe(201)
    expect((await clients.amara.post(`/api/entries/${ids.declined}/witness-request`, { witnessId: ids.priya })).status).toBe(201)
    const noReason = await clients.priya.post(`/api/entries/${ids.declined}/decline`, {})
    expect(noReason.status).toBe(400)
    expect(noReason.body.message).toMatch(/^reason:/)
    expect((await clients.jonah.post(`/api/entries/${ids.declined}/decline`, { reason: 'Not asked.' })).status).toBe(403)
    const reason = 'The cell temperature in the text (296 K) is not the one in the log (298 K).'
    const reply = await clients.priya.post(`/api/entries/${ids.declined}/decline`, { reason })
    expect(reply.status).toBe(200)
    expect(reply.body.entry.state).toBe('declined')
    const mail = await waitForMail('amara.lindqvist@kestrel-ridge.example', /Declined: Declined then amended/)
    expect(mail.text).toContain(reason)
    expect(mail.text).toContain(`${baseURL()}/entries/${ids.declined}`)
  }, 60_000)

  it('amends: a new draft version names the one it supersedes; the old one stays readable as superseded', async () => {
    expect((await clients.priya.post(`/api/entries/${ids.declined}/amend`, {})).status).toBe(403)
    const reply = await clients.amara.post(`/api/entries/${ids.declined}/amend`, { reason: 'Temperature corrected from the log.' })
    expect(reply.status).toBe(201)
    expect(reply.body.entry).toMatchObject({ state: 'draft', version: 2, supersedesVersion: 1 })
    expect((await clients.amara.post(`/api/entries/${ids.declined}/amend`, {})).status).toBe(409)

    const versions = await clients.priya.get(`/api/entries/${ids.declined}/versions`)
    expect(versions.body.current).toMatchObject({ version: 2, state: 'draft' })
    expect(versions.body.versions).toHaveLength(1)
    expect(versions.body.versions[0]).toMatchObject({ version: 1, status: 'superseded' })
    const old = await clients.priya.get(`/api/entries/${ids.declined}/versions/1`)
    expect(old.status).toBe(200)
    expect(old.body.version.status).toBe('superseded')
    expect(old.body.signatures).toHaveLength(1)
    expect((await clients.priya.get(`/api/entries/${ids.declined}/versions/2`)).status).toBe(404)

    // The amended draft signs as version 2, and its record names version 1 as superseded.
    const lockVersion = reply.body.entry.lockVersion
    expect((await clients.amara.patch(`/api/entries/${ids.declined}`, { lockVersion, content: content('298 K') })).status).toBe(200)
    const { challenge, envelope } = await envelopeFor(clients.amara, 'amara', ids.declined, 'authored')
    expect(challenge.record.entry).toMatchObject({ version: 2, supersedes: 1 })
    expect((await clients.amara.post(`/api/entries/${ids.declined}/sign`, { envelope })).status).toBe(201)
    expect((await clients.felix.get(`/api/records/${ids.declined}/verify?version=1`)).body.ok).toBe(true)
    expect((await clients.felix.get(`/api/records/${ids.declined}/verify?version=2`)).body.ok).toBe(true)
    const bad = await clients.felix.get(`/api/records/${ids.declined}/verify?version=two`)
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^version:/)
  }, 60_000)

  it('the audit timeline holds every step', async () => {
    const events = (await clients.amara.get(`/api/entries/${ids.declined}/audit`)).body.events.map((e: { action: string }) => e.action)
    expect(events).toEqual(expect.arrayContaining(['entry_created', 'entry_signed', 'witness_requested', 'entry_declined', 'entry_amended']))
    const keysAudited = await database.query(`SELECT count(*)::int AS n FROM audit_events WHERE action IN ('signing_key_registered', 'signing_key_retired') AND actor_id = $1`, [ids.amara])
    expect(keysAudited.rows[0].n).toBeGreaterThanOrEqual(3)
  })
})

describe('tampering behind the triggers\' back', () => {
  it('verify reports a stored content row altered with the triggers disabled', async () => {
    const { rows: [version] } = await database.query(`SELECT id, content FROM entry_versions WHERE entry_id = $1 AND version = 1`, [ids.journey])
    const forged = structuredClone(version.content)
    forged.content[1].attrs.input.temperature = '350 K'
    await database.query('ALTER TABLE entry_versions DISABLE TRIGGER entry_versions_frozen')
    try {
      await database.query('UPDATE entry_versions SET content = $2 WHERE id = $1', [version.id, forged])
    }
    finally {
      await database.query('ALTER TABLE entry_versions ENABLE TRIGGER entry_versions_frozen')
    }
    try {
      const reply = await clients.felix.get(`/api/records/${ids.journey}/verify`)
      expect(reply.status).toBe(200)
      expect(reply.body.ok).toBe(false)
      // The record document that was signed is intact (its hash holds); the frozen row beside it is not.
      expect(reply.body.recordHash.ok).toBe(true)
      expect(reply.body.record.ok).toBe(false)
      expect(reply.body.record.problems.join(' ')).toMatch(/stored content differs from the content signed/)
      // The signatures themselves are intact: they still cover the record that was signed.
      expect(reply.body.signatures.every((s: { ok: boolean }) => s.ok)).toBe(true)
    }
    finally {
      await database.query('ALTER TABLE entry_versions DISABLE TRIGGER entry_versions_frozen')
      await database.query('UPDATE entry_versions SET content = $2 WHERE id = $1', [version.id, version.content])
      await database.query('ALTER TABLE entry_versions ENABLE TRIGGER entry_versions_frozen')
    }
    expect((await clients.felix.get(`/api/records/${ids.journey}/verify`)).body.ok).toBe(true)
  })

  it('verify reports a stored statement altered with the triggers disabled', async () => {
    const { rows: [signature] } = await database.query(
      `SELECT s.id, s.statement FROM signatures s JOIN entry_versions v ON v.id = s.entry_version_id WHERE v.entry_id = $1 AND s.meaning = 'witnessed'`, [ids.journey])
    const forged = { ...signature.statement, signer: { ...signature.statement.signer, name: 'Someone Else' } }
    await database.query('ALTER TABLE signatures DISABLE TRIGGER signatures_frozen')
    try {
      await database.query('UPDATE signatures SET statement = $2 WHERE id = $1', [signature.id, forged])
      const reply = await clients.felix.get(`/api/records/${ids.journey}/verify`)
      expect(reply.body.ok).toBe(false)
      const witness = reply.body.signatures.find((s: { meaning: string }) => s.meaning === 'witnessed')
      expect(witness.ok).toBe(false)
      expect(witness.problems.join(' ')).toMatch(/the signature does not match the statement/)
      expect(witness.problems.join(' ')).toMatch(/does not match the statement hash recorded when it was signed/)
    }
    finally {
      await database.query('UPDATE signatures SET statement = $2 WHERE id = $1', [signature.id, signature.statement])
      await database.query('ALTER TABLE signatures ENABLE TRIGGER signatures_frozen')
    }
    expect((await clients.felix.get(`/api/records/${ids.journey}/verify`)).body.ok).toBe(true)
  })
})

describe('a stored file changed on disk', () => {
  it('verify names the file whose bytes no longer match the signed SHA-256', async () => {
    const { rows: [file] } = await database.query(`SELECT storage_key FROM attachments WHERE entry_id = $1`, [ids.journey])
    const path = join(dirname(inject('mailDir')), 'uploads', file.storage_key)
    const original = readFileSync(path)
    writeFileSync(path, 'wavenumber,intensity\n667.4,0.91\n')
    try {
      const reply = await clients.felix.get(`/api/records/${ids.journey}/verify`)
      expect(reply.body.ok).toBe(false)
      expect(reply.body.record.problems.join(' ')).toMatch(/bending-band\.csv no longer match/)
    }
    finally {
      writeFileSync(path, original)
    }
    expect((await clients.felix.get(`/api/records/${ids.journey}/verify`)).body.ok).toBe(true)
  })
})

describe('the local mail catcher page', () => {
  it('lists caught messages for an administrator', async () => {
    const reply = await clients.hana.get('/api/admin/mail')
    expect(reply.status).toBe(200)
    expect(reply.body.messages.some((m: { to: string[], subject: string }) => m.to.includes('priya.natarajan@kestrel-ridge.example') && m.subject.startsWith('Witness request'))).toBe(true)
  })
})
