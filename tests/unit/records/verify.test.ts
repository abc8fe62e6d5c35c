import fc from 'fast-check'
import nacl from 'tweetnacl'
import { describe, expect, it } from 'vitest'
import {
  buildBundle,
  buildRecord,
  bytesToBase64,
  calculationsFromContent,
  generateSigningKeyPair,
  keyFingerprint,
  recordHash,
  signStatement,
  statementBytes,
  statementHash,
  verifyBundle,
  verifySignature,
} from '#shared/records'
import type { PublicKeyListing, RecordBundle, RecordDocument, SigningMeaning, SigningStatement } from '#shared/records'

// Scenarios from DESIGN.md, "The signed record": author and witness signatures over one record.

// A real record: its calculation is the engine's for the block in its content, as the one
// verifier recomputes it (shared/records/recheck.ts).
const content = {
  type: 'doc',
  content: [
    { type: 'paragraph', content: [{ type: 'text', text: 'Two-level check, demo values.' }] },
    { type: 'calculationBlock', attrs: { blockId: 'block-1', kind: 'levels', title: 'Two levels', collapsed: false, input: { temperature: '300 K', levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 2 }] } } },
  ],
}
const record = buildRecord({
  entry: {
    id: 'entry-1',
    notebook: { id: 'notebook-1', name: 'Demo spectra' },
    version: 1,
    supersedes: null,
    title: 'Two-level populations at 300 K',
    content: content as unknown as Record<string, never>,
  },
  calculations: calculationsFromContent(content),
})

async function makeSigner(id: string, name: string, { createdAt = '2025-01-01T00:00:00.000Z', retiredAt = null as string | null } = {}) {
  const keys = generateSigningKeyPair()
  const person = { id, name, email: `${id}@example.org` }
  const fingerprint = await keyFingerprint(keys.publicKey)
  const listing: PublicKeyListing = { fingerprint, publicKey: bytesToBase64(keys.publicKey), owner: person, createdAt, retiredAt }
  return { keys, person, fingerprint, listing }
}
type Signer = Awaited<ReturnType<typeof makeSigner>>

async function statementFor(
  signer: Signer,
  meaning: SigningMeaning,
  { of = record, signedAt = '2025-03-01T12:00:00.000Z', countersigns }: { of?: RecordDocument; signedAt?: string; countersigns?: string } = {},
): Promise<SigningStatement> {
  return {
    schema: 'thermotome.statement/1',
    recordHash: await recordHash(of),
    signer: signer.person,
    keyFingerprint: signer.fingerprint,
    meaning,
    statement: `I, ${signer.person.name}, ${meaning} this record.`,
    signedAt,
    challenge: crypto.randomUUID(),
    ...(countersigns === undefined ? {} : { countersigns }),
  }
}

/** Ada authors, Grace witnesses: the ordinary, valid case. */
async function signedBundle() {
  const ada = await makeSigner('user-ada', 'Ada Lovelace')
  const grace = await makeSigner('user-grace', 'Grace Hopper')
  const authored = await signStatement(await statementFor(ada, 'authored'), ada.keys.secretKey)
  const witnessed = await signStatement(
    await statementFor(grace, 'witnessed', { signedAt: '2025-03-01T13:00:00.000Z', countersigns: await statementHash(authored.statement) }),
    grace.keys.secretKey,
  )
  const bundle = await buildBundle({ record, signatures: [authored, witnessed], publicKeys: [ada.listing, grace.listing] })
  return { ada, grace, authored, witnessed, bundle }
}

const clone = <T>(value: T): T => structuredClone(value)

describe('signStatement and verifySignature', () => {
  it('round-trips, and the signature covers the canonical JSON bytes', async () => {
    const ada = await makeSigner('user-ada', 'Ada Lovelace')
    const envelope = await signStatement(await statementFor(ada, 'authored'), ada.keys.secretKey)
    expect(verifySignature(envelope)).toBe(true)
    // RFC 8032 Ed25519 over UTF-8 of RFC 8785 canonical JSON, checked with tweetnacl directly
    expect(
      nacl.sign.detached.verify(statementBytes(envelope.statement), Uint8Array.from(atob(envelope.signature), (c) => c.charCodeAt(0)), ada.keys.publicKey),
    ).toBe(true)
  })

  it('fails verification when any statement field changes', async () => {
    const ada = await makeSigner('user-ada', 'Ada Lovelace')
    const envelope = await signStatement(await statementFor(ada, 'authored'), ada.keys.secretKey)
    expect(verifySignature({ ...envelope, statement: { ...envelope.statement, meaning: 'reviewed' } })).toBe(false)
    expect(verifySignature({ ...envelope, statement: { ...envelope.statement, signedAt: '2024-03-01T12:00:00.000Z' } })).toBe(false)
  })

  it('returns false, not throws, for malformed envelopes', () => {
    expect(verifySignature({} as never)).toBe(false)
    expect(verifySignature(null as never)).toBe(false)
  })

  it('refuses to sign when keyFingerprint names another key', async () => {
    const ada = await makeSigner('user-ada', 'Ada Lovelace')
    const mallory = await makeSigner('user-mallory', 'Mallory')
    await expect(signStatement(await statementFor(ada, 'authored'), mallory.keys.secretKey)).rejects.toThrow(/keyFingerprint/)
  })

  it('refuses to sign a statement with a missing field, naming it', async () => {
    const ada = await makeSigner('user-ada', 'Ada Lovelace')
    const { challenge: _challenge, ...withoutChallenge } = await statementFor(ada, 'authored')
    await expect(signStatement(withoutChallenge as SigningStatement, ada.keys.secretKey)).rejects.toThrow(/statement\.challenge/)
  })
})

describe('verifyBundle', () => {
  it('accepts an authored and a witnessed signature over the record', async () => {
    const { bundle } = await signedBundle()
    const report = await verifyBundle(JSON.parse(JSON.stringify(bundle)))
    expect(report.problems).toEqual([])
    expect(report.ok).toBe(true)
    expect(report.recordHash).toEqual({ stated: bundle.recordHash, computed: bundle.recordHash, ok: true })
    expect(report.signatures.map((check) => [check.index, check.signer.name, check.meaning, check.ok])).toEqual([
      [0, 'Ada Lovelace', 'authored', true],
      [1, 'Grace Hopper', 'witnessed', true],
    ])
  })

  it('reports a record changed after signing, with both hashes', async () => {
    const { bundle } = await signedBundle()
    const changed = clone(bundle)
    changed.record.calculations[0]!.result = { mostPopulatedJ: 53 }
    const computed = await recordHash(changed.record)
    const report = await verifyBundle(changed)
    expect(report.ok).toBe(false)
    expect(report.recordHash).toEqual({ stated: bundle.recordHash, computed, ok: false })
    expect(report.signatures.every((check) => !check.ok)).toBe(true)
    expect(report.problems).toContain(
      `signatures[0] (Ada Lovelace, authored): the record was changed after signing: its hash is ${computed} but this signature covers ${bundle.recordHash}`,
    )
  })

  it('still catches a changed record when the bundle hash was recomputed to match', async () => {
    const { bundle } = await signedBundle()
    const changed = clone(bundle)
    changed.record.entry.title = 'Something else'
    changed.recordHash = await recordHash(changed.record)
    const report = await verifyBundle(changed)
    expect(report.recordHash.ok).toBe(true)
    expect(report.ok).toBe(false)
    expect(report.signatures[0]!.problems.join()).toMatch(/the record was changed after signing/)
  })

  it('fails a signature made by another key', async () => {
    const { bundle, authored } = await signedBundle()
    const mallory = generateSigningKeyPair()
    const forged = clone(bundle)
    forged.signatures[0]!.signature = bytesToBase64(nacl.sign.detached(statementBytes(authored.statement), mallory.secretKey))
    const report = await verifyBundle(forged)
    expect(report.ok).toBe(false)
    expect(report.signatures[0]!.problems).toEqual([
      'the signature does not match the statement: the statement was altered after signing, or it was signed with another key',
    ])
    // The witness countersigned a signature that no longer holds.
    expect(report.signatures[1]!.problems).toEqual(['the signature it countersigns, signatures[0], is itself not valid'])
  })

  it('fails when someone signs in another person’s name with their own listed key', async () => {
    const { bundle } = await signedBundle()
    const mallory = await makeSigner('user-mallory', 'Mallory')
    const statement = { ...(await statementFor(mallory, 'reviewed')), signer: bundle.signatures[0]!.statement.signer }
    const envelope = await signStatement(statement, mallory.keys.secretKey)
    const report = await verifyBundle({ ...bundle, signatures: [...bundle.signatures, envelope], publicKeys: [...bundle.publicKeys, mallory.listing] })
    expect(report.ok).toBe(false)
    expect(report.signatures[2]!.problems.join()).toMatch(/belongs to Mallory \(user-mallory\), not to the signer Ada Lovelace \(user-ada\)/)
  })

  it('fails a signature whose key is not listed, or listed with another key', async () => {
    const { bundle, grace } = await signedBundle()
    const unlisted = await verifyBundle({ ...bundle, publicKeys: [grace.listing] })
    expect(unlisted.signatures[0]!.problems.join()).toMatch(/^key SHA256:[0-9a-f ]+ is not among the bundle's public keys$/)

    const swapped = clone(bundle)
    const adaListing = swapped.publicKeys.find((listing) => listing.owner.id === 'user-ada')!
    adaListing.publicKey = bytesToBase64(generateSigningKeyPair().publicKey)
    const report = await verifyBundle(swapped)
    expect(report.ok).toBe(false)
    expect(report.problems.join('\n')).toMatch(/publicKeys\[\d\] \(Ada Lovelace\) is listed as SHA256:.* but the key's fingerprint is SHA256:/)
    expect(report.signatures[0]!.problems.join()).toMatch(/is not the key that made this signature/)
  })

  it('fails a signature made after its key was retired, and accepts one made before', async () => {
    const ada = await makeSigner('user-ada', 'Ada Lovelace', { retiredAt: '2025-02-01T00:00:00.000Z' })
    const late = await signStatement(await statementFor(ada, 'authored', { signedAt: '2025-03-01T12:00:00.000Z' }), ada.keys.secretKey)
    const lateReport = await verifyBundle(await buildBundle({ record, signatures: [late], publicKeys: [ada.listing] }))
    expect(lateReport.ok).toBe(false)
    expect(lateReport.signatures[0]!.problems).toEqual([
      'its key was retired at 2025-02-01T00:00:00.000Z, before it was signed at 2025-03-01T12:00:00.000Z',
    ])

    const early = await signStatement(await statementFor(ada, 'authored', { signedAt: '2025-01-15T12:00:00.000Z' }), ada.keys.secretKey)
    const earlyReport = await verifyBundle(await buildBundle({ record, signatures: [early], publicKeys: [ada.listing] }))
    expect(earlyReport.problems).toEqual([])
    expect(earlyReport.ok).toBe(true)
  })

  it('fails a signature dated before its key existed', async () => {
    const ada = await makeSigner('user-ada', 'Ada Lovelace', { createdAt: '2025-06-01T00:00:00.000Z' })
    const envelope = await signStatement(await statementFor(ada, 'authored'), ada.keys.secretKey)
    const report = await verifyBundle(await buildBundle({ record, signatures: [envelope], publicKeys: [ada.listing] }))
    expect(report.signatures[0]!.problems.join()).toMatch(/before its key was created/)
  })

  it('requires a witness to countersign an authored signature by someone else', async () => {
    const { ada, grace, authored } = await signedBundle()
    const check = async (witnessed: SigningStatement, signer: Signer) => {
      const envelope = await signStatement(witnessed, signer.keys.secretKey)
      const bundle = await buildBundle({ record, signatures: [authored, envelope], publicKeys: [ada.listing, grace.listing] })
      return (await verifyBundle(bundle)).signatures[1]!.problems
    }
    const authoredHash = await statementHash(authored.statement)
    const later = '2025-03-01T13:00:00.000Z'

    expect(await check(await statementFor(grace, 'witnessed', { signedAt: later }), grace)).toEqual([
      'a witness signature must name the authored signature it countersigns, and countersigns is missing',
    ])
    expect(await check(await statementFor(grace, 'witnessed', { signedAt: later, countersigns: 'f'.repeat(64) }), grace)).toEqual([
      `it countersigns ${'f'.repeat(64)}, which is not the statement hash or id of another signature in this bundle`,
    ])
    expect(await check(await statementFor(ada, 'witnessed', { signedAt: later, countersigns: authoredHash }), ada)).toEqual([
      'Ada Lovelace cannot witness their own signature; a witness must be a different person',
    ])
    expect(
      await check(await statementFor(grace, 'witnessed', { signedAt: '2025-03-01T11:00:00.000Z', countersigns: authoredHash }), grace),
    ).toEqual(['it was signed at 2025-03-01T11:00:00.000Z, before the signature it countersigns (2025-03-01T12:00:00.000Z)'])
  })

  it('resolves countersigns by a signature id when the envelope carries one', async () => {
    const { ada, grace, authored } = await signedBundle()
    const witnessed = await signStatement(
      await statementFor(grace, 'witnessed', { signedAt: '2025-03-01T13:00:00.000Z', countersigns: 'signature-17' }),
      grace.keys.secretKey,
    )
    const bundle = await buildBundle({
      record,
      signatures: [{ ...authored, id: 'signature-17' }, witnessed],
      publicKeys: [ada.listing, grace.listing],
    })
    expect((await verifyBundle(bundle)).problems).toEqual([])
  })

  it('is not ok without any signature', async () => {
    const report = await verifyBundle(await buildBundle({ record, signatures: [], publicKeys: [] }))
    expect(report.ok).toBe(false)
    expect(report.problems).toEqual(['the bundle carries no signatures, so nothing vouches for the record'])
  })

  it('answers a non-bundle with ok:false and problems naming the field', async () => {
    const { bundle } = await signedBundle()
    for (const input of [null, undefined, 'a bundle', 42, [], {}]) {
      const report = await verifyBundle(input)
      expect(report.ok).toBe(false)
      expect(report.signatures).toEqual([])
      expect(report.problems[0]).toBe('this is not a valid Thermotome record bundle')
    }
    expect((await verifyBundle('a bundle')).problems).toContain('bundle: expected object, received string')
    expect((await verifyBundle({})).problems).toContain('bundle.record: expected object, received undefined')

    const wrongType = clone(bundle) as unknown as { record: { entry: { version: unknown } } }
    wrongType.record.entry.version = '1'
    const report = await verifyBundle(wrongType)
    expect(report.problems).toContain('bundle.record.entry.version: expected number, received string')
    expect(report.recordHash.stated).toBe(bundle.recordHash)

    const badSignature = clone(bundle) as RecordBundle
    badSignature.signatures[1]!.signature = 'not base64!'
    expect((await verifyBundle(badSignature)).problems).toContain(
      'bundle.signatures[1].signature: expected an Ed25519 signature: 64 bytes in standard padded base64',
    )

    const extra = { ...clone(bundle), note: 'added later' }
    expect((await verifyBundle(extra)).problems).toContain('bundle: Unrecognized key: "note"')
  })

  it('never throws, whatever it is given (property, fast-check)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.anything({ withBigInt: true, withMap: true, withSet: true, withTypedArray: true, withNullPrototype: true }), async (input) => {
        const report = await verifyBundle(input)
        expect(report.ok).toBe(false)
        expect(report.problems.length).toBeGreaterThan(0)
      }),
      { numRuns: 200 },
    )
  })
})
