import nacl from 'tweetnacl'
import { describe, expect, it } from 'vitest'
import { bytesToHex, canonicalJson, hexToBytes, sha256Hex, utf8Bytes } from '#shared/records'

// Published test vectors. The hex below was written from memory of the documents named; every
// test checks itself against an independent computation (key derivation, verification, hashing),
// so a mistyped vector fails instead of passing.

describe('Ed25519 (RFC 8032 §7.1)', () => {
  const vectors = [
    {
      // RFC 8032 §7.1, TEST 1
      name: 'TEST 1 (empty message)',
      secretKey: '9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60',
      publicKey: 'd75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a',
      message: '',
      signature:
        'e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46bd25bf5f0595bbe24655141438e7a100b',
    },
    {
      // RFC 8032 §7.1, TEST 2
      name: 'TEST 2 (one byte 0x72)',
      secretKey: '4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb',
      publicKey: '3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c',
      message: '72',
      signature:
        '92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613d0f11d8c387b2eaeb4302aeeb00d291612bb0c00',
    },
    {
      // RFC 8032 §7.1, TEST 3
      name: 'TEST 3 (two bytes 0xaf82)',
      secretKey: 'c5aa8df43f9f837bedb7442f31dcb7b166d38535076f094b85ce3a2e0b4458f7',
      publicKey: 'fc51cd8e6218a1a38da47ed00230f0580816ed13ba3303ac5deb911548908025',
      message: 'af82',
      signature:
        '6291d657deec24024827e69c3abe01a30ce548a284743a445e3680d7db5ac3ac18ff9b538d16f290ae67f760984dc6594a7c15e9716ed28dc027beceea1ec40a',
    },
  ]

  for (const vector of vectors) {
    it(`${vector.name}: public key, signature and verification match the RFC`, () => {
      const pair = nacl.sign.keyPair.fromSeed(hexToBytes(vector.secretKey))
      expect(bytesToHex(pair.publicKey)).toBe(vector.publicKey)
      const message = hexToBytes(vector.message)
      // Ed25519 is deterministic (RFC 8032 §5.1.6), so the published signature must be reproduced exactly.
      expect(bytesToHex(nacl.sign.detached(message, pair.secretKey))).toBe(vector.signature)
      expect(nacl.sign.detached.verify(message, hexToBytes(vector.signature), hexToBytes(vector.publicKey))).toBe(true)
    })
  }

  it('TEST 2 signature does not verify for a different message', () => {
    // RFC 8032 §7.1 TEST 2 key and signature, message changed from 0x72 to 0x73
    const signature = hexToBytes(vectors[1]!.signature)
    expect(nacl.sign.detached.verify(hexToBytes('73'), signature, hexToBytes(vectors[1]!.publicKey))).toBe(false)
  })
})

describe('JSON canonicalization (RFC 8785)', () => {
  it('serialises numbers, string escapes and literals as in §3.2.2 → §3.2.3', () => {
    // RFC 8785 §3.2.2 input (also canonicalize's test/testdata/input/values.json)
    const input = String.raw`{
      "numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],
      "string": "\u20ac$\u000F\u000aA'\u0042\u0022\u005c\\\"\/",
      "literals": [null, true, false]
    }`
    // RFC 8785 §3.2.3 expected output
    const expected = String.raw`{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\u000f\nA'B\"\\\\\"/"}`
    expect(canonicalJson(JSON.parse(input))).toBe(expected)
  })

  it('sorts property names by UTF-16 code units as in §3.2.3', () => {
    // RFC 8785 §3.2.3, property sorting example
    const input = {
      '\u20ac': 'Euro Sign',
      '\r': 'Carriage Return',
      '\ufb33': 'Hebrew Letter Dalet With Dagesh',
      '1': 'One',
      '\ud83d\ude00': 'Emoji: Grinning Face',
      '\u0080': 'Control',
      '\u00f6': 'Latin Small Letter O With Diaeresis',
    }
    // RFC 8785 §3.2.3: the order the values must come out in
    const order = [
      'Carriage Return',
      'One',
      'Control',
      'Latin Small Letter O With Diaeresis',
      'Euro Sign',
      'Emoji: Grinning Face',
      'Hebrew Letter Dalet With Dagesh',
    ]
    const output = canonicalJson(input)
    const positions = order.map((value) => output.indexOf(`"${value}"`))
    expect(positions.every((position) => position > 0)).toBe(true)
    expect([...positions].sort((a, b) => a - b)).toEqual(positions)
    // Full text follows from §3.2.2.2: only \r needs an escape, U+0080 and above are written as is.
    expect(output).toBe(
      '{"\\r":"Carriage Return","1":"One","\u0080":"Control","\u00f6":"Latin Small Letter O With Diaeresis",' +
        '"\u20ac":"Euro Sign","\ud83d\ude00":"Emoji: Grinning Face","\ufb33":"Hebrew Letter Dalet With Dagesh"}',
    )
  })

  it('hashes the UTF-8 of the canonical text (RFC 8785 §3.2.4: € is e2 82 ac)', () => {
    // RFC 8785 §3.2.4 gives the canonical output as UTF-8 bytes; the euro sign is e2 82 ac.
    expect(bytesToHex(utf8Bytes(canonicalJson('€')))).toBe('22e282ac22')
  })
})

describe('SHA-256 (FIPS 180-2 appendix B)', () => {
  it('hashes "abc" (one block, B.1)', async () => {
    // FIPS 180-2 appendix B.1
    expect(await sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad')
  })

  it('hashes the two-block message (B.2)', async () => {
    // FIPS 180-2 appendix B.2
    expect(await sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    )
  })

  it('gives the same hash for a string and its UTF-8 bytes', async () => {
    // Consistency with FIPS 180-2 B.1 through the byte path
    expect(await sha256Hex(utf8Bytes('abc'))).toBe(await sha256Hex('abc'))
  })
})
