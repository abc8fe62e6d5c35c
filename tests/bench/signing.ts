/**
 * Signing benchmarks (issue 5), run with tsx:
 *
 *   npx tsx tests/bench/signing.ts                      verification only: 1,000 Ed25519 signatures, tweetnacl vs node:crypto
 *   THERMOTOME_BENCH_URL=http://127.0.0.1:3000 npx tsx tests/bench/signing.ts [--runs 50]
 *                                                       also the sign and countersign routes against a running server with the demo lab
 *
 * Route latency is the time of the POST alone (challenge, key unsealing and signing happen
 * before the clock starts), as seen by a client on the same machine. Prints median and p95.
 */
import nacl from 'tweetnacl'
import {
  generateSigningKeyPair,
  keyFingerprint,
  sealSecretKey,
  signStatement,
  statementBytes,
} from '../../shared/records/index'
import type { SigningStatement } from '../../shared/records/index'
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { ed25519Verify } from '../../server/utils/ed25519'

function percentile(sorted: number[], fraction: number) {
  return sorted[Math.min(sorted.length - 1, Math.ceil(fraction * sorted.length) - 1)]!
}
function summary(name: string, times: number[]) {
  const sorted = [...times].sort((a, b) => a - b)
  console.log(`${name.padEnd(34)} median ${percentile(sorted, 0.5).toFixed(2).padStart(8)} ms   p95 ${percentile(sorted, 0.95).toFixed(2).padStart(8)} ms   (${times.length} runs)`)
}

async function verificationBenchmark(count = 1000) {
  const items = []
  for (let index = 0; index < count; index++) {
    const pair = nacl.sign.keyPair()
    const message = statementBytes({
      schema: 'thermotome.statement/1', recordHash: 'a'.repeat(64), signer: { id: String(index), name: 'Bench', email: 'bench@example.invalid' },
      keyFingerprint: 'b'.repeat(64), meaning: 'authored', statement: 'bench', signedAt: new Date().toISOString(), challenge: `nonce-${index}`,
    })
    items.push({ message, signature: nacl.sign.detached(message, pair.secretKey), publicKey: pair.publicKey })
  }
  for (const [name, verify] of [
    ['tweetnacl', (m: Uint8Array, s: Uint8Array, k: Uint8Array) => nacl.sign.detached.verify(m, s, k)],
    ['node:crypto (KeyObject per key)', ed25519Verify],
  ] as const) {
    verify(items[0]!.message, items[0]!.signature, items[0]!.publicKey) // warm-up
    const start = performance.now()
    let valid = 0
    for (const item of items) if (verify(item.message, item.signature, item.publicKey)) valid++
    const elapsed = performance.now() - start
    console.log(`verify ${count} signatures, ${name.padEnd(32)} ${elapsed.toFixed(0).padStart(7)} ms total, ${(elapsed / count * 1000).toFixed(0).padStart(6)} µs each, ${valid} valid`)
  }
}

class BenchClient {
  cookie = ''
  constructor(readonly base: string, readonly address: string) {}
  async request(method: string, path: string, body?: unknown) {
    const response = await fetch(`${this.base}${path}`, {
      method, body: body === undefined ? undefined : JSON.stringify(body),
      headers: { 'content-type': 'application/json', 'x-forwarded-for': this.address, ...(this.cookie ? { cookie: this.cookie } : {}) },
    })
    for (const cookie of response.headers.getSetCookie()) this.cookie = cookie.split(';')[0]!
    const text = await response.text()
    let parsed: any = text
    try { parsed = JSON.parse(text) } catch { /* not JSON */ }
    return { status: response.status, body: parsed }
  }
}

async function routeBenchmark(base: string, runs: number) {
  const person = (key: string) => DEMO_PEOPLE.find(p => p.key === key)!
  const clients: Record<string, BenchClient> = {}
  const secretKeys: Record<string, Uint8Array> = {}
  for (const [index, who] of ['amara', 'priya'].entries()) {
    const client = new BenchClient(base, `192.0.2.${200 + index}`)
    const login = await client.request('POST', '/api/auth/login', { email: person(who).email, password: DEMO_PASSWORD })
    if (login.status !== 200) throw new Error(`sign-in of ${who} failed: ${login.status}`)
    const pair = generateSigningKeyPair()
    const existing = await client.request('GET', '/api/keys')
    const registered = await client.request('POST', '/api/keys', {
      publicKey: Buffer.from(pair.publicKey).toString('base64'), sealedSecretKey: await sealSecretKey(pair.secretKey, 'bench passphrase words'),
      password: DEMO_PASSWORD, ...(existing.body.active ? { replaces: 'rotated' } : {}),
    })
    if (registered.status !== 201) throw new Error(`key registration for ${who} failed: ${JSON.stringify(registered.body)}`)
    clients[who] = client
    secretKeys[who] = pair.secretKey
    await keyFingerprint(pair.publicKey)
  }
  const notebooks = (await clients.amara!.request('GET', '/api/notebooks')).body.notebooks as { id: string, name: string }[]
  const notebook = notebooks.find(n => n.name.startsWith('Infrared'))!.id
  const people = (await clients.priya!.request('GET', '/api/auth/me')).body.person as { id: string }

  async function envelope(who: string, entryId: string, meaning: 'authored' | 'witnessed') {
    const challenge = (await clients[who]!.request('POST', `/api/entries/${entryId}/challenge`, { meaning })).body
    const statement: SigningStatement = {
      schema: 'thermotome.statement/1', recordHash: challenge.recordHash, signer: challenge.signer, keyFingerprint: challenge.keyFingerprint,
      meaning, statement: challenge.statementText, signedAt: challenge.issuedAt, challenge: challenge.nonce,
      ...(challenge.countersigns ? { countersigns: challenge.countersigns } : {}),
    }
    return signStatement(statement, secretKeys[who]!)
  }

  const signTimes: number[] = []
  const countersignTimes: number[] = []
  for (let run = 0; run < runs + 3; run++) {
    const created = await clients.amara!.request('POST', `/api/notebooks/${notebook}/entries`, {
      title: `Bench entry ${run} ${Date.now()}`,
      content: { type: 'doc', content: [{ type: 'calculationBlock', attrs: { blockId: `bench-${run}`, kind: 'levels', title: 'Bench', input: { temperature: '296 K', levels: [{ energy: '0 cm^-1' }, { energy: '667 cm^-1', degeneracy: 2 }] } } }] },
    })
    const entryId = created.body.entry.id as string
    const authored = await envelope('amara', entryId, 'authored')
    let start = performance.now()
    const signed = await clients.amara!.request('POST', `/api/entries/${entryId}/sign`, { envelope: authored })
    const signTime = performance.now() - start
    if (signed.status !== 201) throw new Error(`sign failed: ${JSON.stringify(signed.body)}`)
    await clients.amara!.request('POST', `/api/entries/${entryId}/witness-request`, { witnessId: people.id })
    const witnessed = await envelope('priya', entryId, 'witnessed')
    start = performance.now()
    const countersigned = await clients.priya!.request('POST', `/api/entries/${entryId}/countersign`, { envelope: witnessed })
    const countersignTime = performance.now() - start
    if (countersigned.status !== 201) throw new Error(`countersign failed: ${JSON.stringify(countersigned.body)}`)
    if (run >= 3) { // the first runs warm up the server
      signTimes.push(signTime)
      countersignTimes.push(countersignTime)
    }
  }
  summary('POST /api/entries/:id/sign', signTimes)
  summary('POST /api/entries/:id/countersign', countersignTimes)
}

const runsIndex = process.argv.indexOf('--runs')
const runs = runsIndex >= 0 ? Number(process.argv[runsIndex + 1]) : 50
await verificationBenchmark()
if (process.env.THERMOTOME_BENCH_URL) await routeBenchmark(process.env.THERMOTOME_BENCH_URL, runs)
else console.log('Set THERMOTOME_BENCH_URL to a running server with the demo lab to time the sign and countersign routes.')
