import { ed25519 } from '@noble/curves/ed25519.js'

// Strict Ed25519 verification (RFC 8032 §5.1.7), the same rule on every side. The raw check
// is injected: node:crypto (OpenSSL) on the server and in the CLI, @noble/curves in the
// browser. Both are wrapped in the same strict checks first, because raw verifiers differ on
// the edge cases: tweetnacl accepts S + L (a second valid-looking signature for the same
// statement), and none of them refuses a public key of small order, for which one signature
// can verify for many messages. A signature is good only if every check here passes.

/** A raw Ed25519 verifier: true when `signature` (64 bytes) is valid for `message` under `publicKey` (32 bytes). */
export type Ed25519Verify = (message: Uint8Array, signature: Uint8Array, publicKey: Uint8Array) => boolean

/** The order L of the Ed25519 base point (RFC 8032 §5.1): 2^252 + 27742317777372353535851937790883648493. */
const GROUP_ORDER = 2n ** 252n + 27742317777372353535851937790883648493n

function littleEndianNumber(bytes: Uint8Array): bigint {
  let value = 0n
  for (let index = bytes.length - 1; index >= 0; index--) value = (value << 8n) | BigInt(bytes[index]!)
  return value
}

/**
 * Why this signature and key fail the strict rules before any curve equation is checked, or
 * null: lengths, S < L (RFC 8032 §5.1.7 step 1), and a public key that decodes canonically to
 * a point of large order (small-order keys refused, as libsodium and noble's strict mode do).
 */
export function ed25519StrictProblem(signature: Uint8Array, publicKey: Uint8Array): string | null {
  if (signature.length !== 64) return `an Ed25519 signature has 64 bytes, this one has ${signature.length}`
  if (publicKey.length !== 32) return `an Ed25519 public key has 32 bytes, this one has ${publicKey.length}`
  if (littleEndianNumber(signature.subarray(32)) >= GROUP_ORDER)
    return 'the signature is not in canonical form (its S is not below the group order L, RFC 8032 §5.1.7)'
  let point
  try {
    point = ed25519.Point.fromBytes(publicKey, false)
  }
  catch {
    return 'the public key is not a canonical encoding of a point on the Ed25519 curve'
  }
  if (point.isSmallOrder()) return 'the public key is a point of small order, which proves nothing about who signed'
  return null
}

/** Wraps a raw verifier in the strict checks; never throws. */
export function strictEd25519(raw: Ed25519Verify): Ed25519Verify {
  return (message, signature, publicKey) => {
    if (ed25519StrictProblem(signature, publicKey) !== null) return false
    try {
      return raw(message, signature, publicKey)
    }
    catch {
      return false
    }
  }
}

/** The browser's raw verifier: @noble/curves in its RFC 8032 mode (zip215 off). */
export const nobleEd25519Verify: Ed25519Verify = (message, signature, publicKey) =>
  ed25519.verify(signature, message, publicKey, { zip215: false })

/** The strict verifier for places without node:crypto (the browser). */
export const strictEd25519Verify: Ed25519Verify = strictEd25519(nobleEd25519Verify)
