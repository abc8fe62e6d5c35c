// Signed records made directly, for tests and benchmarks that need them without going through
// the signing routes: real Ed25519 keys (shared/records), real engine results (shared/thermo),
// rows inserted with SQL into signing_keys, entries, entry_versions, signatures and a properly
// chained audit trail. `signedBundle` is pure (no database); `createSignedRecord` stores one.
import { randomUUID } from 'node:crypto'
import pg from 'pg'
import nacl from 'tweetnacl'
import {
  buildBundle, buildRecord, calculationsFromContent, generateSigningKeyPair, keyFingerprint, sealSecretKey, signStatement, statementHash,
  STATEMENT_SCHEMA, bytesToBase64, type RecordBundle, type SignatureEnvelope, type SigningKeyPair,
} from '../../shared/records'
import { levelsKind } from '../../shared/thermo/kinds/levels'
import { auditRowHash, GENESIS_HASH } from '../../server/database/audit-chain'

export interface FixturePerson { id: string, name: string, email: string }
export interface FixtureKey { pair: SigningKeyPair, fingerprint: string, createdAt: string, id: string }

/** A key made for a person; `createdAt` must be before any signature made with it. */
export async function fixtureKey(createdAt = '2020-01-01T00:00:00.000Z'): Promise<FixtureKey> {
  const pair = generateSigningKeyPair()
  return { pair, fingerprint: await keyFingerprint(pair.publicKey), createdAt, id: randomUUID() }
}

const paragraph = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] })

/** Entry content with prose, marks, a list, a table and calculation blocks (levels + rotation by default). */
export function fixtureContent(blocks: { blockId: string, kind: string, title: string, input: unknown }[]) {
  return {
    type: 'doc',
    content: [
      { type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: 'Purpose' }] },
      {
        type: 'paragraph',
        content: [
          { type: 'text', text: 'Populations of the CO ladder at ' },
          { type: 'text', text: '298.15 K', marks: [{ type: 'bold' }] },
          { type: 'text', text: '; band origin ν₀ ≈ 2143 cm⁻¹, θ', marks: [] },
          { type: 'text', text: 'vib', marks: [{ type: 'subscript' }] },
          { type: 'text', text: ' from hc', marks: [] },
          { type: 'text', text: 'ω', marks: [{ type: 'italic' }] },
          { type: 'text', text: '/k. Checked by Łukasz and Søren.' },
        ],
      },
      { type: 'bulletList', content: [
        { type: 'listItem', content: [paragraph('Cell held at 296 K, 20.0 mbar.')] },
        { type: 'listItem', content: [paragraph('Path 12.4 m; 64 scans averaged.')] },
      ] },
      { type: 'table', content: [
        { type: 'tableRow', content: [
          { type: 'tableHeader', content: [paragraph('Quantity')] },
          { type: 'tableHeader', content: [paragraph('Value')] },
        ] },
        { type: 'tableRow', content: [
          { type: 'tableCell', content: [paragraph('Pressure')] },
          { type: 'tableCell', content: [paragraph('20.0 mbar')] },
        ] },
      ] },
      ...blocks.map(block => ({ type: 'calculationBlock', attrs: { ...block, collapsed: false } })),
      paragraph('End of entry.'),
    ],
  }
}

export const DEFAULT_BLOCKS = [
  {
    kind: 'levels', title: 'CO vibrational ladder at 298.15 K',
    input: levelsKind.exampleInput,
  },
  {
    kind: 'rotation', title: 'CO rotational populations',
    input: { rotationalConstant: '1.9313 cm^-1', temperature: '298.15 K', maxJ: 30 },
  },
]

export interface SignedBundleOptions {
  entryId?: string
  notebook: { id: string, name: string }
  title: string
  version?: number
  author: FixturePerson
  authorKey: FixtureKey
  witness?: FixturePerson
  witnessKey?: FixtureKey
  /** ISO time of the author's signature; the witness signs an hour later. */
  signedAt?: string
  blocks?: { kind: string, title: string, input: unknown }[]
  attachments?: { name: string, mediaType: string, size: number, sha256: string }[]
  /** Make a bundle that every verifier must refuse (tests/api/verify-cases.test.ts). */
  tamper?: BundleTamper
}

/**
 * Attacks on a signature that a lenient verifier lets through:
 * - 'malleated-signature': the author's S replaced by S + L (tweetnacl alone accepts it);
 * - 'small-order-key': the author "signs" with the identity point as public key (R = identity,
 *   S = 0 verifies for every message);
 * - 'witness-before-author': the witness's countersignature dated an hour before the author's.
 */
export type BundleTamper = 'malleated-signature' | 'small-order-key' | 'witness-before-author'

/** The Ed25519 identity point (y = 1), a public key of order 1. */
export const SMALL_ORDER_PUBLIC_KEY = Uint8Array.from([1, ...new Array(31).fill(0)])
const GROUP_ORDER = 2n ** 252n + 27742317777372353535851937790883648493n

/** The signature with S + L in place of S (RFC 8032 §5.1.7 refuses it; tweetnacl does not). */
export function malleatedSignature(signatureBase64: string): string {
  const bytes = Uint8Array.from(Buffer.from(signatureBase64, 'base64'))
  let s = 0n
  for (let index = 63; index >= 32; index--) s = (s << 8n) | BigInt(bytes[index]!)
  s += GROUP_ORDER
  for (let index = 32; index < 64; index++) {
    bytes[index] = Number(s & 0xffn)
    s >>= 8n
  }
  return bytesToBase64(bytes)
}

/** A fixture key whose public key is of small order; it has no secret key worth the name. */
export async function smallOrderKey(createdAt = '2020-01-01T00:00:00.000Z'): Promise<FixtureKey> {
  return { pair: { publicKey: SMALL_ORDER_PUBLIC_KEY, secretKey: new Uint8Array(64) }, fingerprint: await keyFingerprint(SMALL_ORDER_PUBLIC_KEY), createdAt, id: randomUUID() }
}

export interface SignedBundle {
  bundle: RecordBundle
  entryId: string
  content: Record<string, unknown>
  envelopes: { envelope: SignatureEnvelope, signer: FixturePerson, key: FixtureKey, statementHash: string }[]
}

/** A complete, valid bundle: record with engine results, author signature, optional witness. */
export async function signedBundle(options: SignedBundleOptions): Promise<SignedBundle> {
  const entryId = options.entryId ?? randomUUID()
  const version = options.version ?? 1
  const signedAt = options.signedAt ?? '2026-03-02T10:15:30.000Z'
  const blocks = (options.blocks ?? DEFAULT_BLOCKS).map((block, index) => ({ ...block, blockId: `${entryId.slice(0, 8)}-block-${index + 1}` }))
  const content = fixtureContent(blocks)
  const record = buildRecord({
    entry: { id: entryId, notebook: options.notebook, version, supersedes: version > 1 ? version - 1 : null, title: options.title, content: content as never },
    attachments: options.attachments ?? [],
    // Evaluated as the app records them (calculationsFromContent: engine results in their JSON form).
    calculations: calculationsFromContent(content),
  })
  const { recordHash } = await buildBundle({ record, signatures: [], publicKeys: [] })
  const envelopes: SignedBundle['envelopes'] = []
  const authorStatement = {
    schema: STATEMENT_SCHEMA as typeof STATEMENT_SCHEMA, recordHash, signer: options.author, keyFingerprint: options.authorKey.fingerprint,
    meaning: 'authored' as const, statement: 'I authored this entry and its calculations are as I intended them.',
    signedAt, challenge: randomUUID(),
  }
  const authored = options.tamper === 'small-order-key'
    // R = identity, S = 0: [S]B = R + [k]A holds for any message when A is the identity.
    ? { statement: authorStatement, signature: bytesToBase64(Uint8Array.from([...SMALL_ORDER_PUBLIC_KEY, ...new Array(32).fill(0)])), publicKey: bytesToBase64(SMALL_ORDER_PUBLIC_KEY) }
    : await signStatement(authorStatement, options.authorKey.pair.secretKey)
  if (options.tamper === 'malleated-signature') authored.signature = malleatedSignature(authored.signature)
  const authoredHash = await statementHash(authored.statement)
  envelopes.push({ envelope: authored, signer: options.author, key: options.authorKey, statementHash: authoredHash })
  if (options.witness && options.witnessKey) {
    const witnessed = await signStatement({
      schema: STATEMENT_SCHEMA as typeof STATEMENT_SCHEMA, recordHash, signer: options.witness, keyFingerprint: options.witnessKey.fingerprint,
      meaning: 'witnessed', statement: 'I have read and understood this entry.',
      signedAt: new Date(Date.parse(signedAt) + (options.tamper === 'witness-before-author' ? -3_600_000 : 3_600_000)).toISOString(), challenge: randomUUID(), countersigns: authoredHash,
    }, options.witnessKey.pair.secretKey)
    envelopes.push({ envelope: witnessed, signer: options.witness, key: options.witnessKey, statementHash: await statementHash(witnessed.statement) })
  }
  const listings = new Map<string, RecordBundle['publicKeys'][number]>()
  for (const { signer, key } of envelopes) {
    listings.set(key.fingerprint, { fingerprint: key.fingerprint, publicKey: bytesToBase64(key.pair.publicKey), owner: signer, createdAt: key.createdAt, retiredAt: null })
  }
  const bundle = await buildBundle({ record, signatures: envelopes.map(item => item.envelope), publicKeys: [...listings.values()] })
  return { bundle, entryId, content, envelopes }
}

// ---------------------------------------------------------------------------------------
// Stored records

const keysByPerson = new Map<string, FixtureKey>()

async function appendAudit(client: pg.ClientBase, event: { occurredAt: Date, actorId: string | null, actorEmail: string | null, action: string, subjectType: string, subjectId: string, details: Record<string, unknown> }) {
  await client.query('SELECT pg_advisory_xact_lock(874202)')
  const last = await client.query('SELECT hash FROM audit_events ORDER BY sequence DESC LIMIT 1')
  const row = { ...event, previousHash: (last.rows[0]?.hash as string | undefined) ?? GENESIS_HASH }
  await client.query(
    `INSERT INTO audit_events (occurred_at, actor_id, actor_email, action, subject_type, subject_id, details, previous_hash, hash)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)`,
    [row.occurredAt, row.actorId, row.actorEmail, row.action, row.subjectType, row.subjectId, JSON.stringify(row.details), row.previousHash, auditRowHash(row)],
  )
}

/** This process's key for a person, stored once in signing_keys (any other active key is retired). */
async function keyFor(client: pg.ClientBase, person: FixturePerson): Promise<FixtureKey> {
  const known = keysByPerson.get(person.id)
  if (known) return known
  const key = await fixtureKey()
  await client.query('UPDATE signing_keys SET retired_at = $2, retired_reason = $3 WHERE person_id = $1 AND retired_at IS NULL', [person.id, new Date(), 'replaced by a test fixture key'])
  const sealed = await sealSecretKey(key.pair.secretKey, 'fixture passphrase')
  await client.query(
    // Confirmed at once, as a records officer would have: fixture keys stand for keys that may sign.
    'INSERT INTO signing_keys (id, person_id, public_key, fingerprint, sealed_secret_key, created_at, confirmed_at) VALUES ($1, $2, $3, $4, $5, $6, $6)',
    [key.id, person.id, bytesToBase64(key.pair.publicKey), key.fingerprint, JSON.stringify(sealed), new Date(key.createdAt)],
  )
  keysByPerson.set(person.id, key)
  return key
}

/** The small-order key stored for a person as a key that was active in 2020–2099 (retired, so it does not replace their key). */
async function storedSmallOrderKey(client: pg.ClientBase, person: FixturePerson): Promise<FixtureKey> {
  const key = await smallOrderKey()
  const { rows } = await client.query('SELECT id FROM signing_keys WHERE fingerprint = $1', [key.fingerprint])
  if (rows[0]) return { ...key, id: rows[0].id as string }
  await client.query(
    `INSERT INTO signing_keys (id, person_id, public_key, fingerprint, sealed_secret_key, created_at, confirmed_at, retired_at, retired_reason)
     VALUES ($1, $2, $3, $4, $5, $6, $6, '2099-01-01T00:00:00Z', 'a test fixture of small order')`,
    [key.id, person.id, bytesToBase64(key.pair.publicKey), key.fingerprint, JSON.stringify(await sealSecretKey(nacl.randomBytes(64), 'fixture passphrase')), new Date(key.createdAt)],
  )
  return key
}

export interface StoredRecordOptions {
  /** Demo e-mail of the author (a member of the notebook). */
  authorEmail: string
  witnessEmail?: string
  /** Start of the notebook's name, e.g. 'Infrared'. */
  notebook: string
  title: string
  signedAt?: string
  blocks?: SignedBundleOptions['blocks']
  attachments?: SignedBundleOptions['attachments']
  tamper?: BundleTamper
}

export interface StoredRecord extends SignedBundle { versionId: string, notebookId: string, authorId: string, witnessId: string | null }

/** Stores a signed (and optionally witnessed) entry version; the entry's state follows. */
export async function createSignedRecord(databaseURL: string, options: StoredRecordOptions, shared?: pg.Client): Promise<StoredRecord> {
  const client = shared ?? new pg.Client({ connectionString: databaseURL })
  if (!shared) await client.connect()
  try {
    const person = async (email: string): Promise<FixturePerson> => {
      const { rows } = await client.query('SELECT id, name, email FROM people WHERE lower(email) = lower($1)', [email])
      if (!rows[0]) throw new Error(`no person ${email}`)
      return rows[0] as FixturePerson
    }
    const author = await person(options.authorEmail)
    const witness = options.witnessEmail ? await person(options.witnessEmail) : undefined
    const { rows: notebooks } = await client.query('SELECT id, name FROM notebooks WHERE name LIKE $1 ORDER BY name LIMIT 1', [`${options.notebook}%`])
    if (!notebooks[0]) throw new Error(`no notebook ${options.notebook}`)
    const notebook = notebooks[0] as { id: string, name: string }
    await client.query('BEGIN')
    const authorKey = options.tamper === 'small-order-key' ? await storedSmallOrderKey(client, author) : await keyFor(client, author)
    const witnessKey = witness ? await keyFor(client, witness) : undefined
    const made = await signedBundle({ notebook, title: options.title, author, authorKey, witness, witnessKey, signedAt: options.signedAt, blocks: options.blocks, attachments: options.attachments, tamper: options.tamper })
    const signedAt = new Date(made.envelopes[0]!.envelope.statement.signedAt)
    // No state column: the state follows from the frozen version and its signatures.
    await client.query(
      `INSERT INTO entries (id, notebook_id, author_id, title, content, version, created_at, updated_at)
       VALUES ($1, $2, $3, $4, $5, 1, $6, $6)`,
      [made.entryId, notebook.id, author.id, options.title, JSON.stringify(made.content), new Date(signedAt.getTime() - 86_400_000)],
    )
    for (const file of options.attachments ?? []) {
      await client.query(
        'INSERT INTO attachments (entry_id, name, storage_key, media_type, size, sha256, uploaded_by) VALUES ($1, $2, $3, $4, $5, $6, $7)',
        [made.entryId, file.name, `fixtures/${file.sha256}`, file.mediaType, file.size, file.sha256, author.id],
      )
    }
    const { rows: [version] } = await client.query(
      `INSERT INTO entry_versions (entry_id, version, title, content, record, record_hash, frozen_at, frozen_by)
       VALUES ($1, 1, $2, $3, $4, $5, $6, $7) RETURNING id`,
      [made.entryId, options.title, JSON.stringify(made.content), JSON.stringify(made.bundle.record), made.bundle.recordHash, signedAt, author.id],
    )
    let authorSignatureId: string | null = null
    for (const { envelope, signer, key, statementHash: hash } of made.envelopes) {
      const { rows: [signature] }: { rows: { id: string }[] } = await client.query(
        `INSERT INTO signatures (entry_version_id, signer_id, key_id, meaning, statement, statement_hash, signature, signed_at, countersigns_id)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING id`,
        [version.id, signer.id, key.id, envelope.statement.meaning, JSON.stringify(envelope.statement), hash, envelope.signature, new Date(envelope.statement.signedAt), envelope.statement.meaning === 'witnessed' ? authorSignatureId : null],
      )
      if (envelope.statement.meaning === 'authored') authorSignatureId = signature!.id
      await appendAudit(client, {
        occurredAt: new Date(envelope.statement.signedAt), actorId: signer.id, actorEmail: signer.email,
        // The actions and details the signing routes write (server/utils/transitions.ts), which verification looks for.
        action: envelope.statement.meaning === 'authored' ? 'entry_signed' : 'entry_witnessed',
        subjectType: 'entry', subjectId: made.entryId, details: { version: 1, title: options.title, recordHash: made.bundle.recordHash, signatureId: signature!.id, statementHash: hash, keyFingerprint: key.fingerprint },
      })
    }
    await client.query('COMMIT')
    return { ...made, versionId: version.id, notebookId: notebook.id, authorId: author.id, witnessId: witness?.id ?? null }
  }
  catch (error) {
    await client.query('ROLLBACK').catch(() => {})
    throw error
  }
  finally {
    if (!shared) await client.end()
  }
}
