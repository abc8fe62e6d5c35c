import { createHash, generateKeyPairSync, sign } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import {
  CheckpointSchema, KeyListSchema, auditEventHashPayload, buildBundle, buildRecord, bytesToBase64, calculationsFromContent, canonicalJson,
  generateSigningKeyPair, keyFingerprint, openRecordsKeyDocument, recordHash, registryOfKeyList, signStatement, statementHash, verifyBundle,
} from '#shared/records'
import type { KeyList, PublicKeyListing, RecordsKeyDocument, RegisteredKey, SigningMeaning } from '#shared/records'
import { ed25519Verify } from '../../../server/utils/ed25519'
import { MerkleTree } from '../../../server/utils/merkleTree'

// The key registry as trust anchor (DESIGN.md "Trust anchors"): a bundle that is perfectly
// self-consistent but signed with keys nobody registered to the people it names is refused,
// naming the key; a replacement key signs only after a records officer confirmed it.

const content = {
  type: 'doc',
  content: [{ type: 'calculationBlock', attrs: { blockId: 'b1', kind: 'levels', title: 'Two levels', collapsed: false, input: { temperature: '300 K', levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 2 }] } } }],
}
const record = buildRecord({
  entry: { id: 'entry-kr-1', notebook: { id: 'nb-kr', name: 'Kestrel Ridge cryostat' }, version: 1, supersedes: null, title: 'Two levels at 300 K', content: content as never },
  calculations: calculationsFromContent(content),
})

async function person(id: string, name: string) {
  const keys = generateSigningKeyPair()
  const who = { id, name, email: `${id}@kestrel-ridge.example` }
  const fingerprint = await keyFingerprint(keys.publicKey)
  const listing: PublicKeyListing = { fingerprint, publicKey: bytesToBase64(keys.publicKey), owner: who, createdAt: '2025-01-01T00:00:00.000Z', retiredAt: null }
  const registered: RegisteredKey = {
    fingerprint, publicKey: listing.publicKey, owner: who, createdAt: listing.createdAt, retiredAt: null, retiredReason: null,
    replacement: false, confirmedAt: listing.createdAt, confirmedBy: null, confirmationReason: null,
  }
  return { keys, who, fingerprint, listing, registered }
}

async function signed(author: Awaited<ReturnType<typeof person>>, witness: Awaited<ReturnType<typeof person>>) {
  const statement = (signer: typeof author, meaning: SigningMeaning, signedAt: string, countersigns?: string) => ({
    schema: 'thermotome.statement/1' as const, recordHash: '', signer: signer.who, keyFingerprint: signer.fingerprint, meaning,
    statement: `${meaning} by ${signer.who.name}`, signedAt, challenge: crypto.randomUUID(), ...(countersigns ? { countersigns } : {}),
  })
  const hash = await recordHash(record)
  const authored = await signStatement({ ...statement(author, 'authored', '2025-03-01T12:00:00.000Z'), recordHash: hash }, author.keys.secretKey)
  const witnessed = await signStatement({ ...statement(witness, 'witnessed', '2025-03-01T13:00:00.000Z', await statementHash(authored.statement)), recordHash: hash }, witness.keys.secretKey)
  return await buildBundle({ record, signatures: [authored, witnessed], publicKeys: [author.listing, witness.listing] })
}

/** A records key and a document signed with it, the way the server signs (node:crypto). */
function recordsKey() {
  const { publicKey, privateKey } = generateKeyPairSync('ed25519')
  const raw = publicKey.export({ format: 'der', type: 'spki' }).subarray(-32)
  const fingerprint = createHash('sha256').update(raw).digest('hex')
  const signDocument = (content: object): RecordsKeyDocument => {
    const payload = canonicalJson(content as never)
    return { payload, signature: sign(null, Buffer.from(payload, 'utf8'), privateKey).toString('base64'), recordsKey: raw.toString('base64') }
  }
  return { fingerprint, signDocument }
}

describe('verification against the key registry', () => {
  it('a bundle forged with fresh keys under real names is self-consistent, and refused against the registry, naming the key', async () => {
    const realAmara = await person('amara', 'Amara Okafor')
    const realBen = await person('ben', 'Ben Whitlock')
    const forgerAmara = await person('amara', 'Amara Okafor')
    const forgerBen = await person('ben', 'Ben Whitlock')
    const forged = await signed(forgerAmara, forgerBen)
    const selfConsistent = await verifyBundle(forged, { verifyEd25519: ed25519Verify })
    expect(selfConsistent.ok).toBe(true)
    expect(selfConsistent.registry.checked).toBe(false)
    expect(selfConsistent.notes).toContain('signatures are self-consistent; keys not checked against a registry')

    const registry = { source: 'the test registry', keys: [realAmara.registered, realBen.registered] }
    const report = await verifyBundle(forged, { verifyEd25519: ed25519Verify, registry })
    expect(report.ok).toBe(false)
    expect(report.registry).toEqual({ checked: true, source: 'the test registry' })
    const display = (fingerprint: string) => `SHA256:${fingerprint.match(/.{4}/g)!.join(' ')}`
    expect(report.problems.join('\n')).toContain(`key ${display(forgerAmara.fingerprint)} is not in the key registry`)
    expect(report.problems.join('\n')).toContain(`key ${display(forgerBen.fingerprint)} is not in the key registry`)

    const genuine = await verifyBundle(await signed(realAmara, realBen), { verifyEd25519: ed25519Verify, registry })
    expect(genuine.problems).toEqual([])
    expect(genuine.signatures.map(check => check.registeredKey?.fingerprint)).toEqual([realAmara.fingerprint, realBen.fingerprint])
  })

  it('refuses a key registered to someone else, a replacement not confirmed when it signed, and a retired key', async () => {
    const amara = await person('amara', 'Amara Okafor')
    const ben = await person('ben', 'Ben Whitlock')
    const bundle = await signed(amara, ben)
    const problemsWith = async (key: RegisteredKey) => (await verifyBundle(bundle, { verifyEd25519: ed25519Verify, registry: { source: 'r', keys: [key, ben.registered] } })).signatures[0]!.problems
    expect((await problemsWith({ ...amara.registered, owner: ben.who })).join()).toMatch(/is registered to Ben Whitlock \(ben\), not to the signer Amara Okafor/)
    expect((await problemsWith({ ...amara.registered, replacement: true, confirmedAt: null })).join()).toMatch(/never confirmed by a records officer/)
    expect((await problemsWith({ ...amara.registered, replacement: true, confirmedAt: '2025-03-02T00:00:00.000Z', confirmedBy: ben.who, confirmationReason: 'checked in person' })).join()).toMatch(/confirmed only at 2025-03-02T00:00:00.000Z, after it signed/)
    expect((await problemsWith({ ...amara.registered, retiredAt: '2025-02-01T00:00:00.000Z', retiredReason: 'rotated' })).join()).toMatch(/was retired at 2025-02-01/)
    expect(await problemsWith({ ...amara.registered, replacement: true, confirmedAt: '2025-02-01T00:00:00.000Z', confirmedBy: ben.who, confirmationReason: 'checked in person' })).toEqual([])
  })
})

describe('records-key documents', () => {
  it('a signed key list opens under its records key, and any edit or another records key is refused', async () => {
    const organisation = recordsKey()
    const amara = await person('amara', 'Amara Okafor')
    const list: KeyList = { schema: 'thermotome.keylist/1', issuedAt: '2025-04-01T00:00:00.000Z', recordsKey: organisation.fingerprint, keys: [amara.registered] }
    const document = organisation.signDocument(list)
    const opened = await openRecordsKeyDocument(document, KeyListSchema, 'key list', ed25519Verify, organisation.fingerprint)
    expect(opened.ok).toBe(true)
    if (opened.ok) expect(registryOfKeyList(opened.content).keys).toEqual([amara.registered])

    const edited = { ...document, payload: document.payload.replace('Amara Okafor', 'Amara Okafur') }
    const refused = await openRecordsKeyDocument(edited, KeyListSchema, 'key list', ed25519Verify)
    expect(refused.ok).toBe(false)
    if (!refused.ok) expect(refused.problems).toContain('the key list\'s signature does not verify under the records key it names: it was changed after signing')

    const impostor = recordsKey()
    const other = impostor.signDocument({ ...list, recordsKey: impostor.fingerprint })
    const wrongKey = await openRecordsKeyDocument(other, KeyListSchema, 'key list', ed25519Verify, organisation.fingerprint)
    expect(wrongKey.ok).toBe(false)
    if (!wrongKey.ok) expect(wrongKey.problems.join()).toMatch(/not by the organisation's records key/)
  })

  it('an audit event carried in a bundle is proven in the signed checkpoint, and a rewritten one is not', async () => {
    const organisation = recordsKey()
    const amara = await person('amara', 'Amara Okafor')
    const ben = await person('ben', 'Ben Whitlock')
    const bundle = await signed(amara, ben)
    // A log of five events; the third is this entry's signing event.
    const rows = ['session_started', 'notebook_created', 'entry_signed', 'entry_witnessed', 'record_exported'].map((action, index) => ({
      occurredAt: `2025-03-01T1${index}:00:00.000Z`, actorId: 'amara', actorEmail: 'amara@kestrel-ridge.example', action,
      subjectType: index >= 2 ? 'entry' : null, subjectId: index >= 2 ? record.entry.id : null, details: {} as Record<string, never>, previousHash: '',
    }))
    const hashes: string[] = []
    for (const [index, row] of rows.entries()) {
      row.previousHash = index === 0 ? '0'.repeat(64) : hashes[index - 1]!
      hashes.push(createHash('sha256').update(auditEventHashPayload(row)).digest('hex'))
    }
    const tree = new MerkleTree(hashes.map(hash => Buffer.from(hash, 'hex')))
    const checkpoint = organisation.signDocument({ schema: 'thermotome.checkpoint/1', treeSize: 5, rootHash: tree.root().toString('hex'), signedAt: '2025-03-02T00:00:00.000Z', recordsKey: organisation.fingerprint })
    expect(CheckpointSchema.safeParse(JSON.parse(checkpoint.payload)).success).toBe(true)
    const events = [2, 3].map(index => ({
      ...rows[index]!, sequence: index + 1, actorName: 'Amara Okafor', hash: hashes[index]!, leafIndex: index,
      proof: tree.inclusionProof(index).map(node => node.toString('hex')),
    }))
    const withContext = { ...bundle, context: { state: 'witnessed' as const, auditEvents: events, checkpoint } }
    const report = await verifyBundle(withContext, { verifyEd25519: ed25519Verify, trustedRecordsKey: organisation.fingerprint })
    expect(report.problems).toEqual([])
    expect(report.audit).toMatchObject({ events: 2, proven: 2 })

    // The same event with its details rewritten and its hash recomputed: the proof no longer reaches the root.
    const rewritten = { ...events[0]!, details: { note: 'quietly changed' } }
    rewritten.hash = createHash('sha256').update(auditEventHashPayload(rewritten)).digest('hex')
    const tampered = await verifyBundle({ ...withContext, context: { ...withContext.context, auditEvents: [rewritten, events[1]!] } }, { verifyEd25519: ed25519Verify })
    expect(tampered.ok).toBe(false)
    expect(tampered.problems.join('\n')).toMatch(/audit event 3 \(entry_signed\): its inclusion proof does not lead to the checkpoint's root/)
  })
})
