import { describe, expect, it } from 'vitest'
import {
  MIN_PBKDF2_ITERATIONS,
  WrongPassphraseError,
  base64ToBytes,
  bytesEqual,
  bytesToBase64,
  bytesToHex,
  formatFingerprint,
  generateSigningKeyPair,
  hexToBytes,
  keyFingerprint,
  openSealedKey,
  parseFingerprint,
  sealSecretKey,
  sha256Hex,
} from '#shared/records'
import type { SealedKey } from '#shared/records'

describe('base64 without Buffer', () => {
  it('encodes the RFC 4648 §10 test vectors', () => {
    // RFC 4648 §10
    const vectors: [string, string][] = [
      ['', ''],
      ['f', 'Zg=='],
      ['fo', 'Zm8='],
      ['foo', 'Zm9v'],
      ['foob', 'Zm9vYg=='],
      ['fooba', 'Zm9vYmE='],
      ['foobar', 'Zm9vYmFy'],
    ]
    for (const [text, base64] of vectors) {
      expect(bytesToBase64(new TextEncoder().encode(text))).toBe(base64)
      expect(new TextDecoder().decode(base64ToBytes(base64))).toBe(text)
    }
  })

  it('round-trips every byte value and a large buffer', () => {
    const bytes = new Uint8Array(40_000).map((_, index) => index % 256)
    // bytesEqual rather than toEqual: a deep diff of 40,000 elements is slow.
    expect(bytesEqual(base64ToBytes(bytesToBase64(bytes)), bytes)).toBe(true)
  })

  it('refuses non-standard spellings', () => {
    for (const bad of ['Zg', 'Zg=', 'Zh==', 'Z g==', 'Zm9v-_==', 'Zm9v\n']) {
      expect(() => base64ToBytes(bad), bad).toThrow()
    }
  })
})

describe('key fingerprints', () => {
  it('is the SHA-256 of the raw 32-byte public key', async () => {
    // RFC 8032 §7.1 TEST 1 public key, hashed independently with sha256Hex (FIPS 180-4)
    const publicKey = hexToBytes('d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a')
    const fingerprint = await keyFingerprint(publicKey)
    expect(fingerprint).toMatch(/^[0-9a-f]{64}$/)
    expect(fingerprint).toBe(await sha256Hex(publicKey))
  })

  it('refuses a key that is not 32 bytes', async () => {
    await expect(keyFingerprint(new Uint8Array(31))).rejects.toThrow(/32 bytes/)
  })

  it('formats as SHA256: and sixteen groups of four, and parses back', async () => {
    const fingerprint = await keyFingerprint(generateSigningKeyPair().publicKey)
    const shown = formatFingerprint(fingerprint)
    expect(shown).toMatch(/^SHA256:[0-9a-f]{4}( [0-9a-f]{4}){15}$/)
    expect(parseFingerprint(shown)).toBe(fingerprint)
    expect(parseFingerprint(shown.toUpperCase().replace('SHA256:', 'sha256: '))).toBe(fingerprint)
    expect(() => parseFingerprint('SHA256:abcd')).toThrow(/64 hexadecimal/)
  })
})

describe('sealing the secret key under a passphrase', () => {
  const passphrase = 'correct horse battery staple'

  it('round-trips with the default 600,000 iterations and random salt and nonce', async () => {
    const { secretKey } = generateSigningKeyPair()
    const sealed = await sealSecretKey(secretKey, passphrase)
    expect(sealed.kdf).toBe('PBKDF2-SHA-256')
    expect(sealed.iterations).toBe(MIN_PBKDF2_ITERATIONS)
    expect(base64ToBytes(sealed.salt)).toHaveLength(16)
    expect(base64ToBytes(sealed.nonce)).toHaveLength(24)
    expect(bytesToHex(await openSealedKey(sealed, passphrase))).toBe(bytesToHex(secretKey))

    const again = await sealSecretKey(secretKey, passphrase)
    expect(again.salt).not.toBe(sealed.salt)
    expect(again.nonce).not.toBe(sealed.nonce)
    expect(again.sealed).not.toBe(sealed.sealed)
  })

  it('throws WrongPassphraseError for a wrong passphrase', async () => {
    const sealed = await sealSecretKey(generateSigningKeyPair().secretKey, passphrase)
    await expect(openSealedKey(sealed, 'correct horse battery stapler')).rejects.toBeInstanceOf(WrongPassphraseError)
  })

  it('throws WrongPassphraseError when the sealed bytes, nonce or salt were altered', async () => {
    const sealed = await sealSecretKey(generateSigningKeyPair().secretKey, passphrase)
    const flip = (base64: string, index: number) => {
      const bytes = base64ToBytes(base64)
      bytes[index]! ^= 0x01
      return bytesToBase64(bytes)
    }
    const altered: SealedKey[] = [
      { ...sealed, sealed: flip(sealed.sealed, 40) },
      { ...sealed, nonce: flip(sealed.nonce, 0) },
      { ...sealed, salt: flip(sealed.salt, 15) },
      { ...sealed, iterations: sealed.iterations + 1 },
    ]
    for (const tampered of altered) {
      await expect(openSealedKey(tampered, passphrase)).rejects.toBeInstanceOf(WrongPassphraseError)
    }
  })

  it('treats NFC and NFD spellings of a passphrase as the same passphrase', async () => {
    const { secretKey } = generateSigningKeyPair()
    const sealed = await sealSecretKey(secretKey, 'café au lait'.normalize('NFC'))
    expect(await openSealedKey(sealed, 'café au lait'.normalize('NFD'))).toEqual(secretKey)
  })

  it('refuses to seal with fewer than 600,000 iterations or an empty passphrase', async () => {
    const { secretKey } = generateSigningKeyPair()
    await expect(sealSecretKey(secretKey, passphrase, { iterations: 1000 })).rejects.toThrow(/600000.*OWASP/)
    await expect(sealSecretKey(secretKey, '')).rejects.toThrow(/empty/)
    await expect(sealSecretKey(new Uint8Array(32), passphrase)).rejects.toThrow(/64 bytes/)
  })

  it('refuses to open a key stored with fewer than 600,000 iterations, saying why', async () => {
    const sealed = await sealSecretKey(generateSigningKeyPair().secretKey, passphrase)
    await expect(openSealedKey({ ...sealed, iterations: 100_000 }, passphrase)).rejects.toThrow(
      /sealed key\.iterations: fewer than 600000 PBKDF2 iterations .* cheap to guess/,
    )
  })

  it('names the field of a malformed sealed key', async () => {
    const sealed = await sealSecretKey(generateSigningKeyPair().secretKey, passphrase)
    await expect(openSealedKey({ ...sealed, nonce: 'AAAA' }, passphrase)).rejects.toThrow(/sealed key\.nonce: expected a secretbox nonce: 24 bytes/)
    await expect(openSealedKey({ ...sealed, kdf: 'scrypt' } as unknown as SealedKey, passphrase)).rejects.toThrow(/sealed key\.kdf/)
  })
})
