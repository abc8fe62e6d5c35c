import { createPublicKey, verify } from 'node:crypto'
import nacl from 'tweetnacl'
import { describe, expect, it } from 'vitest'
import { ed25519StrictProblem, hexToBytes, strictEd25519, strictEd25519Verify } from '#shared/records'
import { ed25519Verify } from '../../../server/utils/ed25519'

// RFC 8032 §7.1, TEST 1 (empty message). Quoted from memory; the first test checks it against
// node:crypto (OpenSSL) and tweetnacl, so a wrong digit would fail there, not hide.
const RFC_SECRET = hexToBytes('9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60')
const RFC_PUBLIC = hexToBytes('d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a')
const RFC_SIGNATURE = hexToBytes('e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46bd25bf5f0595bbe24655141438e7a100b')
const EMPTY = new Uint8Array(0)

// The group order L (RFC 8032 §5.1).
const L = 2n ** 252n + 27742317777372353535851937790883648493n

function addToS(signature: Uint8Array, addend: bigint): Uint8Array {
  let s = 0n
  for (let index = 63; index >= 32; index--) s = (s << 8n) | BigInt(signature[index]!)
  s += addend
  const out = new Uint8Array(signature)
  for (let index = 32; index < 64; index++) {
    out[index] = Number(s & 0xffn)
    s >>= 8n
  }
  return out
}

const nodeRaw = (message: Uint8Array, signature: Uint8Array, publicKey: Uint8Array) =>
  verify(null, message, createPublicKey({ key: Buffer.concat([Buffer.from('302a300506032b6570032100', 'hex'), publicKey]), format: 'der', type: 'spki' }), signature)

// The identity point (order 1), encoded as y = 1 (RFC 8032 §5.1.2 encoding).
const IDENTITY = hexToBytes(`01${'00'.repeat(31)}`)
// A point of order 8 from the libsodium small-order list (quoted from memory); the test below
// checks with @noble/curves (via the strict check) that it is of small order.
const ORDER_EIGHT = hexToBytes('c7176a703d4dd84fba3c0b760d10670f2a2053fa2c39ccc64ec7fd7792ac037a')

describe('strict Ed25519 (RFC 8032 §5.1.7)', () => {
  it('accepts the RFC 8032 test vector with every verifier', () => {
    expect(nacl.sign.keyPair.fromSeed(RFC_SECRET).publicKey).toEqual(RFC_PUBLIC)
    expect(nacl.sign.detached(EMPTY, nacl.sign.keyPair.fromSeed(RFC_SECRET).secretKey)).toEqual(RFC_SIGNATURE)
    expect(nodeRaw(EMPTY, RFC_SIGNATURE, RFC_PUBLIC)).toBe(true)
    expect(strictEd25519Verify(EMPTY, RFC_SIGNATURE, RFC_PUBLIC)).toBe(true)
    expect(ed25519Verify(EMPTY, RFC_SIGNATURE, RFC_PUBLIC)).toBe(true)
  })

  it('refuses S + L, which tweetnacl alone accepts (a second signature for the same statement)', () => {
    const malleated = addToS(RFC_SIGNATURE, L)
    expect(nacl.sign.detached.verify(EMPTY, malleated, RFC_PUBLIC)).toBe(true) // the attack works on the raw library
    expect(ed25519StrictProblem(malleated, RFC_PUBLIC)).toMatch(/not in canonical form/)
    expect(strictEd25519Verify(EMPTY, malleated, RFC_PUBLIC)).toBe(false)
    expect(ed25519Verify(EMPTY, malleated, RFC_PUBLIC)).toBe(false)
    // Wrapping tweetnacl itself in the strict rules closes it too.
    expect(strictEd25519((m, s, p) => nacl.sign.detached.verify(m, s, p))(EMPTY, malleated, RFC_PUBLIC)).toBe(false)
  })

  it('refuses a small-order public key, for which one signature verifies for every message', () => {
    const signature = new Uint8Array(64)
    signature.set(IDENTITY, 0) // R = identity, S = 0
    for (const message of [EMPTY, new TextEncoder().encode('any statement at all')])
      expect(nacl.sign.detached.verify(message, signature, IDENTITY)).toBe(true) // the attack works on the raw library
    expect(ed25519StrictProblem(signature, IDENTITY)).toMatch(/small order/)
    expect(ed25519StrictProblem(signature, ORDER_EIGHT)).toMatch(/small order/)
    expect(strictEd25519Verify(EMPTY, signature, IDENTITY)).toBe(false)
    expect(ed25519Verify(EMPTY, signature, IDENTITY)).toBe(false)
  })

  it('refuses a key that is not a canonical curve point, and wrong lengths, without throwing', () => {
    const notCanonical = hexToBytes(`ed${'ff'.repeat(30)}7f`) // y = p, not reduced (RFC 8032 §5.1.3 step 1)
    expect(ed25519StrictProblem(RFC_SIGNATURE, notCanonical)).not.toBeNull()
    expect(ed25519Verify(EMPTY, RFC_SIGNATURE.subarray(0, 63), RFC_PUBLIC)).toBe(false)
    expect(ed25519Verify(EMPTY, RFC_SIGNATURE, RFC_PUBLIC.subarray(0, 31))).toBe(false)
  })

  it('agrees with tweetnacl and node:crypto on ordinary signatures, and refuses a changed message', () => {
    for (let round = 0; round < 50; round++) {
      const pair = nacl.sign.keyPair()
      const message = nacl.randomBytes(round * 7)
      const signature = nacl.sign.detached(message, pair.secretKey)
      expect(strictEd25519Verify(message, signature, pair.publicKey)).toBe(true)
      expect(ed25519Verify(message, signature, pair.publicKey)).toBe(true)
      const changed = new Uint8Array([...message, 1])
      expect(strictEd25519Verify(changed, signature, pair.publicKey)).toBe(false)
      expect(ed25519Verify(changed, signature, pair.publicKey)).toBe(false)
    }
  })
})
