import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, sign, type KeyObject } from 'node:crypto'
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname, resolve } from 'node:path'
import { canonicalJson, type RecordsKeyDocument } from '../../shared/records'

// The organisation's records key: an Ed25519 key kept in a file outside the app database
// (THERMOTOME_RECORDS_KEY_FILE, default $THERMOTOME_DATA_DIR/records-key.pem, PKCS #8 PEM as
// OpenSSL writes it). It signs the published key list and the audit checkpoints, so someone
// who can change the database cannot also make the anchors agree. The start and test scripts
// make it when it is missing (scripts/records-key.ts); the server only reads it.

export interface RecordsKey {
  privateKey: KeyObject
  /** Raw 32-byte Ed25519 public key. */
  publicKey: Uint8Array
  /** SHA-256 of the raw public key, hex (the form key lists and checkpoints name). */
  fingerprint: string
  /** SubjectPublicKeyInfo PEM, for `openssl pkeyutl -verify -pubin`. */
  publicKeyPem: string
}

export function recordsKeyPath(): string {
  return resolve(process.env.THERMOTOME_RECORDS_KEY_FILE ?? resolve(process.env.THERMOTOME_DATA_DIR ?? '.data', 'records-key.pem'))
}

function describe(privateKey: KeyObject): RecordsKey {
  if (privateKey.asymmetricKeyType !== 'ed25519') throw new Error('the records key must be an Ed25519 key')
  const publicObject = createPublicKey(privateKey)
  const publicKey = new Uint8Array(publicObject.export({ format: 'der', type: 'spki' }).subarray(-32))
  return {
    privateKey,
    publicKey,
    fingerprint: createHash('sha256').update(publicKey).digest('hex'),
    publicKeyPem: publicObject.export({ format: 'pem', type: 'spki' }).toString(),
  }
}

let cached: { path: string, key: RecordsKey } | null = null

/** The records key from its file, or null when there is none (checkpoints and key lists then cannot be signed). */
export function loadRecordsKey(path = recordsKeyPath()): RecordsKey | null {
  if (cached?.path === path) return cached.key
  if (!existsSync(path)) return null
  const key = describe(createPrivateKey(readFileSync(path)))
  cached = { path, key }
  return key
}

/** Makes the key file (mode 600) when it is missing; answers the key either way. */
export function ensureRecordsKey(path = recordsKeyPath()): { key: RecordsKey, created: boolean } {
  const existing = loadRecordsKey(path)
  if (existing) return { key: existing, created: false }
  mkdirSync(dirname(path), { recursive: true })
  const { privateKey } = generateKeyPairSync('ed25519')
  writeFileSync(path, privateKey.export({ format: 'pem', type: 'pkcs8' }), { mode: 0o600, flag: 'wx' })
  chmodSync(path, 0o600)
  return { key: loadRecordsKey(path)!, created: true }
}

/** A records-key document: the content's canonical JSON, signed (Ed25519 over its UTF-8). */
export function signWithRecordsKey(key: RecordsKey, content: Record<string, unknown>): RecordsKeyDocument {
  const payload = canonicalJson(content as never)
  return {
    payload,
    signature: sign(null, Buffer.from(payload, 'utf8'), key.privateKey).toString('base64'),
    recordsKey: Buffer.from(key.publicKey).toString('base64'),
  }
}
