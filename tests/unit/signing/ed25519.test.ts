import nacl from 'tweetnacl'
import { describe, expect, it } from 'vitest'
import { hexToBytes } from '#shared/records'
import { ed25519Verify } from '../../../server/utils/ed25519'

// RFC 8032 §7.1 TEST 2: the published secret seed, public key, one-byte message and signature.
const TEST_2 = {
  publicKey: '3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c',
  message: '72',
  signature: '92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613d0f11d8c387b2eaeb4302aeeb00d291612bb0c00',
}

/** Adds the group order L = 2^252 + 27742317777372353535851937790883648493 (RFC 8032 §5.1) to S. */
function withSPlusL(signature: Uint8Array): Uint8Array {
  const order = hexToBytes('edd3f55c1a631258d69cf7a2def9de1400000000000000000000000000000010')
  const out = new Uint8Array(signature)
  let carry = 0
  for (let index = 0; index < 32; index++) {
    const sum = out[32 + index]! + order[index]! + carry
    out[32 + index] = sum & 0xff
    carry = sum >> 8
  }
  return out
}

const naclVerify = (message: Uint8Array, signature: Uint8Array, publicKey: Uint8Array) => {
  try { return nacl.sign.detached.verify(message, signature, publicKey) }
  catch { return false }
}

describe('Ed25519 on the server: node:crypto agrees with tweetnacl', () => {
  it('accepts the RFC 8032 §7.1 TEST 2 signature, as tweetnacl does', () => {
    const args = [hexToBytes(TEST_2.message), hexToBytes(TEST_2.signature), hexToBytes(TEST_2.publicKey)] as const
    expect(naclVerify(...args)).toBe(true)
    expect(ed25519Verify(...args)).toBe(true)
  })

  it('agrees on valid signatures and on altered messages, signatures and keys', () => {
    for (let round = 0; round < 12; round++) {
      const pair = nacl.sign.keyPair()
      const other = nacl.sign.keyPair()
      const message = nacl.randomBytes(1 + round * 7)
      const signature = nacl.sign.detached(message, pair.secretKey)
      const alteredMessage = new Uint8Array(message)
      alteredMessage[round % message.length]! ^= 0x01
      const alteredSignature = new Uint8Array(signature)
      alteredSignature[round % 64]! ^= 0x80
      const cases: [Uint8Array, Uint8Array, Uint8Array, boolean][] = [
        [message, signature, pair.publicKey, true],
        [alteredMessage, signature, pair.publicKey, false],
        [message, alteredSignature, pair.publicKey, false],
        [message, signature, other.publicKey, false],
      ]
      for (const [m, s, k, expected] of cases) {
        expect(naclVerify(m, s, k)).toBe(expected)
        expect(ed25519Verify(m, s, k)).toBe(expected)
      }
    }
  }, 120_000)

  it('refuses malformed lengths without throwing', () => {
    const pair = nacl.sign.keyPair()
    const message = new Uint8Array([1, 2, 3])
    const signature = nacl.sign.detached(message, pair.secretKey)
    expect(ed25519Verify(message, signature.subarray(0, 63), pair.publicKey)).toBe(false)
    expect(ed25519Verify(message, signature, pair.publicKey.subarray(0, 31))).toBe(false)
    expect(ed25519Verify(message, new Uint8Array(64), new Uint8Array(32))).toBe(false)
  })

  it('is stricter than tweetnacl on a non-canonical S (S + L): RFC 8032 §5.1.7 requires S < L', () => {
    // tweetnacl does not check the range of S, so the same statement has a second valid
    // signature (malleability); OpenSSL refuses it. The server stores only what Node accepts.
    const pair = nacl.sign.keyPair()
    const message = new Uint8Array([42])
    const malleated = withSPlusL(nacl.sign.detached(message, pair.secretKey))
    expect(naclVerify(message, malleated, pair.publicKey)).toBe(true)
    expect(ed25519Verify(message, malleated, pair.publicKey)).toBe(false)
  })
})
