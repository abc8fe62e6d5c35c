import { createPublicKey, verify, type KeyObject } from 'node:crypto'
import { strictEd25519 } from '../../shared/records/ed25519'

// Node's built-in Ed25519 (OpenSSL) verifies about 10 times faster than tweetnacl's pure
// JavaScript (see tests/bench/signing.ts and tests/unit/signing/ed25519.test.ts, which checks
// both agree). A raw 32-byte key becomes a KeyObject through its SPKI DER form (RFC 8410 §4):
// the fixed 12-byte prefix SEQUENCE { SEQUENCE { OID 1.3.101.112 } BIT STRING } and the key.
const SPKI_ED25519_PREFIX = Buffer.from('302a300506032b6570032100', 'hex')
const keyCache = new Map<string, KeyObject>()
const KEY_CACHE_LIMIT = 1000

/** A Node KeyObject for a raw Ed25519 public key (32 bytes). Throws on any other length. */
export function ed25519PublicKeyObject(publicKey: Uint8Array): KeyObject {
  if (publicKey.length !== 32) throw new Error(`an Ed25519 public key has 32 bytes, this one has ${publicKey.length}`)
  const cacheKey = Buffer.from(publicKey).toString('base64')
  let key = keyCache.get(cacheKey)
  if (!key) {
    key = createPublicKey({ key: Buffer.concat([SPKI_ED25519_PREFIX, publicKey]), format: 'der', type: 'spki' })
    if (keyCache.size >= KEY_CACHE_LIMIT) keyCache.delete(keyCache.keys().next().value!)
    keyCache.set(cacheKey, key)
  }
  return key
}

/** Raw Ed25519 verification of a detached signature with node:crypto. Never throws. */
function nodeEd25519Verify(message: Uint8Array, signature: Uint8Array, publicKey: Uint8Array): boolean {
  if (signature.length !== 64 || publicKey.length !== 32) return false
  try {
    return verify(null, message, ed25519PublicKeyObject(publicKey), signature)
  } catch {
    return false
  }
}

/**
 * Strict Ed25519 (RFC 8032 §5.1.7) verification on the server and in the CLI: the shared strict
 * rules (S < L, no small-order key; shared/records/ed25519.ts) around node:crypto.
 */
export const ed25519Verify = strictEd25519(nodeEd25519Verify)
