import nacl from 'tweetnacl'
import { canonicalJson } from './canonical'
import { base64ToBytes, bytesToBase64, utf8Bytes } from './encoding'
import { keyFingerprint, publicKeyOf } from './keys'
import { strictEd25519Verify, type Ed25519Verify } from './ed25519'
import { SignatureEnvelopeSchema, SigningStatementSchema, parseOrThrow } from './schema'
import type { SignatureEnvelope, SigningStatement } from './schema'

/** The exact bytes an Ed25519 signature covers: UTF-8 of the RFC 8785 canonical JSON. */
export function statementBytes(statement: SigningStatement): Uint8Array {
  return utf8Bytes(canonicalJson(statement))
}

/**
 * Signs a statement with Ed25519 (RFC 8032, nacl.sign.detached). Async because it first checks,
 * with SHA-256, that statement.keyFingerprint names this very key — a mismatch would only
 * surface later as a failed verification. Throws an Error naming any invalid field.
 */
export async function signStatement(statement: SigningStatement, secretKey: Uint8Array): Promise<SignatureEnvelope> {
  const parsed = parseOrThrow(SigningStatementSchema, statement, 'statement')
  const publicKey = publicKeyOf(secretKey)
  const fingerprint = await keyFingerprint(publicKey)
  if (parsed.keyFingerprint !== fingerprint) {
    throw new Error(`statement.keyFingerprint is ${parsed.keyFingerprint} but the secret key's fingerprint is ${fingerprint}`)
  }
  const signature = nacl.sign.detached(statementBytes(parsed), secretKey)
  return { statement: parsed, signature: bytesToBase64(signature), publicKey: bytesToBase64(publicKey) }
}

/**
 * Synchronous: true only when envelope.signature is a valid Ed25519 signature by
 * envelope.publicKey over canonicalJson(envelope.statement), under the strict rules of
 * shared/records/ed25519.ts (`verify` is that strict verifier, node:crypto-backed on the
 * server). It does not ask whose key that is, whether it was retired, or what record it
 * covers — verifyBundle does. Never throws; anything malformed is simply false.
 */
export function verifySignature(envelope: SignatureEnvelope, verify: Ed25519Verify = strictEd25519Verify): boolean {
  const parsed = SignatureEnvelopeSchema.safeParse(envelope)
  if (!parsed.success) return false
  try {
    return verify(
      statementBytes(parsed.data.statement),
      base64ToBytes(parsed.data.signature),
      base64ToBytes(parsed.data.publicKey),
    )
  } catch {
    return false
  }
}
