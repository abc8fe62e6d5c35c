import nacl from 'tweetnacl'
import { base64ToBytes, bytesEqual, bytesToBase64, utf8Bytes } from './encoding'
import { sha256Hex } from './hash'
import { MAX_PBKDF2_ITERATIONS, MIN_PBKDF2_ITERATIONS, SealedKeySchema, parseOrThrow } from './schema'
import type { SealedKey } from './schema'

export interface SigningKeyPair {
  /** 32-byte Ed25519 public key. */
  publicKey: Uint8Array
  /** 64-byte tweetnacl secret key: the 32-byte seed followed by the public key. */
  secretKey: Uint8Array
}

/** A fresh Ed25519 key pair (RFC 8032) from tweetnacl, seeded by crypto.getRandomValues. */
export function generateSigningKeyPair(): SigningKeyPair {
  return nacl.sign.keyPair()
}

/**
 * SHA-256 of the raw 32-byte public key, as 64 lower-case hex digits. This is the form stored
 * and signed (statement.keyFingerprint); formatFingerprint() is for people.
 */
export async function keyFingerprint(publicKey: Uint8Array): Promise<string> {
  if (publicKey.length !== nacl.sign.publicKeyLength) {
    throw new Error(`an Ed25519 public key has ${nacl.sign.publicKeyLength} bytes, this one has ${publicKey.length}`)
  }
  return sha256Hex(publicKey)
}

/**
 * Display form: "SHA256:" and sixteen groups of four hex digits, e.g.
 * "SHA256:ab12 cd34 … 9f0e", short enough groups to read aloud and compare by eye.
 */
export function formatFingerprint(fingerprint: string): string {
  const hex = parseFingerprint(fingerprint)
  return `SHA256:${hex.match(/.{4}/g)!.join(' ')}`
}

/** Accepts the stored or the display form (any case, any spacing) and returns the stored form. */
export function parseFingerprint(fingerprint: string): string {
  const hex = fingerprint.replace(/^\s*SHA256:/i, '').replace(/\s+/g, '').toLowerCase()
  if (!/^[0-9a-f]{64}$/.test(hex)) throw new Error('a key fingerprint is a SHA-256: 64 hexadecimal digits')
  return hex
}

/** Thrown by openSealedKey when secretbox cannot open: a wrong passphrase or altered bytes. */
export class WrongPassphraseError extends Error {
  override name = 'WrongPassphraseError'
  constructor() {
    // Poly1305 cannot tell the two apart, so the message names both.
    super('The signing passphrase is wrong, or the stored sealed key was altered.')
  }
}

function checkIterations(iterations: number): void {
  if (!Number.isInteger(iterations) || iterations < MIN_PBKDF2_ITERATIONS || iterations > MAX_PBKDF2_ITERATIONS) {
    throw new Error(
      `PBKDF2 iterations must be a whole number from ${MIN_PBKDF2_ITERATIONS} (OWASP 2023 minimum for PBKDF2-HMAC-SHA-256) to ${MAX_PBKDF2_ITERATIONS}; got ${iterations}`,
    )
  }
}

/**
 * The 32-byte secretbox key: PBKDF2-HMAC-SHA-256 (RFC 8018 §5.2) through WebCrypto. The
 * passphrase is NFC-normalised so the same words typed on macOS (NFD input) and elsewhere match.
 */
async function deriveSealingKey(passphrase: string, salt: Uint8Array<ArrayBuffer>, iterations: number): Promise<Uint8Array> {
  const subtle = globalThis.crypto.subtle
  const material = await subtle.importKey('raw', utf8Bytes(passphrase.normalize('NFC')), 'PBKDF2', false, ['deriveBits'])
  const bits = await subtle.deriveBits({ name: 'PBKDF2', hash: 'SHA-256', salt, iterations }, material, nacl.secretbox.keyLength * 8)
  return new Uint8Array(bits)
}

/**
 * Seals an Ed25519 secret key under a passphrase: PBKDF2-SHA-256 with a random 16-byte salt,
 * then XSalsa20-Poly1305 (nacl.secretbox) with a random 24-byte nonce. The result is safe to
 * store on the server; the passphrase never leaves the caller.
 */
export async function sealSecretKey(
  secretKey: Uint8Array,
  passphrase: string,
  { iterations = MIN_PBKDF2_ITERATIONS }: { iterations?: number } = {},
): Promise<SealedKey> {
  if (secretKey.length !== nacl.sign.secretKeyLength) {
    throw new Error(`an Ed25519 secret key has ${nacl.sign.secretKeyLength} bytes, this one has ${secretKey.length}`)
  }
  if (passphrase.length === 0) throw new Error('the signing passphrase must not be empty')
  checkIterations(iterations)
  const salt = globalThis.crypto.getRandomValues(new Uint8Array(16))
  const nonce = globalThis.crypto.getRandomValues(new Uint8Array(nacl.secretbox.nonceLength))
  const key = await deriveSealingKey(passphrase, salt, iterations)
  const sealed = nacl.secretbox(secretKey, nonce, key)
  key.fill(0)
  return {
    kdf: 'PBKDF2-SHA-256',
    iterations,
    salt: bytesToBase64(salt),
    nonce: bytesToBase64(nonce),
    sealed: bytesToBase64(sealed),
  }
}

/**
 * Opens a key sealed by sealSecretKey. Throws WrongPassphraseError when the passphrase is
 * wrong or the sealed bytes were altered, and a plain Error naming the field for a malformed
 * SealedKey — including one stored with fewer than 600,000 iterations, which is refused
 * because such a key is cheap to brute-force and must be sealed again.
 */
export async function openSealedKey(sealed: SealedKey, passphrase: string): Promise<Uint8Array> {
  const parsed = parseOrThrow(SealedKeySchema, sealed, 'sealed key')
  const key = await deriveSealingKey(passphrase, base64ToBytes(parsed.salt), parsed.iterations)
  const secretKey = nacl.secretbox.open(base64ToBytes(parsed.sealed), base64ToBytes(parsed.nonce), key)
  key.fill(0)
  if (secretKey === null) throw new WrongPassphraseError()
  // A tweetnacl secret key ends with its public key; check the pair is whole before anyone signs with it.
  const derived = nacl.sign.keyPair.fromSeed(secretKey.subarray(0, 32))
  if (!bytesEqual(derived.publicKey, secretKey.subarray(32))) {
    throw new Error('the sealed key opened but is not a whole Ed25519 secret key')
  }
  return secretKey
}

/** The public half of a 64-byte tweetnacl secret key. */
export function publicKeyOf(secretKey: Uint8Array): Uint8Array {
  if (secretKey.length !== nacl.sign.secretKeyLength) {
    throw new Error(`an Ed25519 secret key has ${nacl.sign.secretKeyLength} bytes, this one has ${secretKey.length}`)
  }
  return nacl.sign.keyPair.fromSecretKey(secretKey).publicKey
}
