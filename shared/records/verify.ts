import { base64ToBytes, bytesEqual } from './encoding'
import { recordHash, statementHash } from './hash'
import { formatFingerprint, keyFingerprint } from './keys'
import { RecordBundleSchema, RecordDocumentSchema, describeIssues } from './schema'
import type { Person, RecordBundle, SignatureEnvelope, SigningMeaning } from './schema'
import { ed25519StrictProblem, strictEd25519, strictEd25519Verify, type Ed25519Verify } from './ed25519'
import { recheckRecord, type DescribeQuantity, type RecordComparison } from './recheck'
import { verifySignature } from './signing'
import { checkAuditEvents, registryCheck, type AuditProofReport, type KeyRegistry, type RegisteredKey } from './anchor'

export interface SignatureCheck {
  /** Position in bundle.signatures, from 0. */
  index: number
  signer: Person
  meaning: SigningMeaning
  signedAt: string
  keyFingerprint: string
  ok: boolean
  problems: string[]
  /** The key as the registry knows it (owner, lifetime, who confirmed a replacement); null when no registry was given or the key is not in it. */
  registeredKey: RegisteredKey | null
}

export interface VerificationReport {
  /**
   * True only when the shape is valid, the hash matches, there is at least one signature and
   * every one is sound, and every calculation recomputed here agrees within the record tolerance.
   */
  ok: boolean
  recordHash: { stated: string | null; computed: string | null; ok: boolean }
  signatures: SignatureCheck[]
  /** The calculations recomputed with this engine and compared within the record tolerance (null when the bundle is unreadable). */
  calculations: RecordComparison | null
  /** Every problem in plain words: the bundle's own, then each signature's, prefixed with which. */
  problems: string[]
  /** What was not checked and why (a block recorded with another engine version is not recomputed). */
  notes: string[]
  /**
   * Whether every signature's key was checked against a key registry (the trust anchor). Without
   * one, `ok` means only that the bundle is self-consistent: anyone can make keys in any name.
   */
  registry: { checked: boolean, source: string | null }
  /** The audit events the bundle carries, checked against its signed checkpoint; null when it carries none. */
  audit: AuditProofReport | null
}

export interface VerifyOptions {
  /** The raw Ed25519 check, wrapped in the strict rules by the caller: node:crypto on the server and CLI; the default is the browser's. */
  verifyEd25519?: Ed25519Verify
  /** Names a result quantity in words for the calculation differences. */
  describeQuantity?: DescribeQuantity
  /**
   * The key registry to check every signature's key against (the database on the server, a
   * verified key list offline): registered to the named signer and able to sign at that time.
   */
  registry?: KeyRegistry
  /** The organisation's records key (fingerprint): the bundle's audit checkpoint must be signed with it. */
  trustedRecordsKey?: string
}

const time = (iso: string) => Date.parse(iso)

/**
 * Checks an exported bundle from nothing but its own contents (DESIGN, "The signed record"):
 * its shape, the record hash, and for every signature the Ed25519 signature, the record it
 * covers, the key's fingerprint, listing, owner and lifetime, and that a witness countersigns
 * an authored signature by someone else. Never throws: anything wrong becomes a problem.
 */
export async function verifyBundle(bundle: unknown, options: VerifyOptions = {}): Promise<VerificationReport> {
  try {
    return await verifyParsedBundle(bundle, options)
  } catch (error) {
    return {
      ok: false,
      recordHash: { stated: null, computed: null, ok: false },
      signatures: [],
      calculations: null,
      problems: [`verification could not finish: ${error instanceof Error ? error.message : String(error)}`],
      notes: [],
      registry: { checked: false, source: null },
      audit: null,
    }
  }
}

async function verifyParsedBundle(input: unknown, options: VerifyOptions): Promise<VerificationReport> {
  const verify = options.verifyEd25519 ?? strictEd25519Verify
  const parsed = RecordBundleSchema.safeParse(input)
  if (!parsed.success) return await shapeFailure(input, describeIssues(parsed.error.issues, 'bundle'), options)
  const bundle = parsed.data

  const problems: string[] = []
  const computed = await recordHash(bundle.record)
  const hashOk = computed === bundle.recordHash
  if (!hashOk) {
    problems.push(`the record does not match the bundle's recordHash: its hash is ${computed} but the bundle states ${bundle.recordHash}`)
  }

  for (const [index, listing] of bundle.publicKeys.entries()) {
    const actual = await keyFingerprint(base64ToBytes(listing.publicKey))
    if (actual !== listing.fingerprint) {
      problems.push(
        `publicKeys[${index}] (${listing.owner.name}) is listed as ${formatFingerprint(listing.fingerprint)} but the key's fingerprint is ${formatFingerprint(actual)}`,
      )
    }
  }
  if (bundle.signatures.length === 0) problems.push('the bundle carries no signatures, so nothing vouches for the record')

  // First pass: what each signature proves on its own; the second pass relates witnesses to authors.
  const checks = await Promise.all(bundle.signatures.map((envelope, index) => checkSignature(bundle, envelope, index, computed, verify)))
  const notes: string[] = []
  // The trust anchor: each key registered to the person its statement names, able to sign then.
  if (options.registry) {
    for (const check of checks) {
      const envelope = bundle.signatures[check.index]!
      const anchored = registryCheck(options.registry, envelope.statement, envelope.publicKey)
      check.registeredKey = anchored.key
      check.problems.push(...anchored.problems)
      notes.push(...anchored.notes)
    }
  }
  const hashes = await Promise.all(bundle.signatures.map((envelope) => statementHash(envelope.statement)))
  const standsAlone = checks.map((check) => check.problems.length === 0)
  for (const check of checks) checkCountersignature(bundle, check, hashes, standsAlone)

  for (const check of checks) {
    check.ok = check.problems.length === 0
    const label = `signatures[${check.index}] (${check.signer.name}, ${check.meaning})`
    for (const problem of check.problems) problems.push(`${label}: ${problem}`)
  }

  // The numbers: recomputed here and compared within the record tolerance (shared/records/recheck.ts).
  const calculations = recheckRecord(bundle.record, options.describeQuantity)
  for (const block of calculations.blocks) {
    if (block.what === 'engine') notes.push(block.message)
    else problems.push(`calculations: ${block.message}`)
  }

  // The audit events an export carries, anchored by a checkpoint signed with the records key.
  let audit: AuditProofReport | null = null
  if (bundle.context) {
    const signatureIds = bundle.signatures.flatMap(envelope => envelope.id === undefined ? [] : [envelope.id])
    audit = await checkAuditEvents(bundle.context.auditEvents, bundle.context.checkpoint, verify, options.trustedRecordsKey, signatureIds)
    for (const event of bundle.context.auditEvents) {
      if (event.subjectType !== 'entry' || event.subjectId !== bundle.record.entry.id)
        audit.problems.push(`audit event ${event.sequence} (${event.action}) is not an event of this entry`)
    }
    if (audit.checkpoint !== null && options.trustedRecordsKey === undefined)
      audit.notes.push('the audit checkpoint is signed by the records key it names; give the organisation\'s records key to know it is theirs')
    problems.push(...audit.problems.map(problem => `audit: ${problem}`))
    notes.push(...audit.notes.map(note => `audit: ${note}`))
  }
  if (!options.registry) notes.push('signatures are self-consistent; keys not checked against a registry')
  return {
    ok: problems.length === 0,
    recordHash: { stated: bundle.recordHash, computed, ok: hashOk },
    signatures: checks,
    calculations,
    problems,
    notes,
    registry: { checked: options.registry !== undefined, source: options.registry?.source ?? null },
    audit,
  }
}

async function shapeFailure(input: unknown, problems: string[], options: VerifyOptions): Promise<VerificationReport> {
  const candidate = typeof input === 'object' && input !== null ? (input as Record<string, unknown>) : {}
  const stated = typeof candidate.recordHash === 'string' ? candidate.recordHash : null
  // Still report the hash of a well-formed record, which helps tell a damaged wrapper from a damaged record.
  const record = RecordDocumentSchema.safeParse(candidate.record)
  const computed = record.success ? await recordHash(record.data) : null
  return {
    ok: false,
    recordHash: { stated, computed, ok: stated !== null && stated === computed },
    signatures: [],
    calculations: null,
    problems: ['this is not a valid Thermotome record bundle', ...problems],
    notes: [],
    registry: { checked: options.registry !== undefined, source: options.registry?.source ?? null },
    audit: null,
  }
}

async function checkSignature(
  bundle: RecordBundle,
  envelope: SignatureEnvelope,
  index: number,
  computedRecordHash: string,
  verify: Ed25519Verify,
): Promise<SignatureCheck> {
  const { statement } = envelope
  const problems: string[] = []

  const strictProblem = ed25519StrictProblem(base64ToBytes(envelope.signature), base64ToBytes(envelope.publicKey))
  if (strictProblem !== null) {
    problems.push(`the signature is refused: ${strictProblem}`)
  }
  else if (!verifySignature(envelope, strictEd25519(verify))) {
    problems.push('the signature does not match the statement: the statement was altered after signing, or it was signed with another key')
  }
  if (statement.recordHash !== computedRecordHash) {
    problems.push(`the record was changed after signing: its hash is ${computedRecordHash} but this signature covers ${statement.recordHash}`)
  }

  const signingKey = base64ToBytes(envelope.publicKey)
  const actualFingerprint = await keyFingerprint(signingKey)
  if (actualFingerprint !== statement.keyFingerprint) {
    problems.push(
      `the statement names key ${formatFingerprint(statement.keyFingerprint)} but was signed with key ${formatFingerprint(actualFingerprint)}`,
    )
  }

  const listing = bundle.publicKeys.find((candidate) => candidate.fingerprint === statement.keyFingerprint)
  if (listing === undefined) {
    problems.push(`key ${formatFingerprint(statement.keyFingerprint)} is not among the bundle's public keys`)
  } else {
    if (!bytesEqual(base64ToBytes(listing.publicKey), signingKey)) {
      problems.push(`the public key listed as ${formatFingerprint(listing.fingerprint)} is not the key that made this signature`)
    }
    if (listing.owner.id !== statement.signer.id) {
      problems.push(
        `key ${formatFingerprint(listing.fingerprint)} belongs to ${listing.owner.name} (${listing.owner.id}), not to the signer ${statement.signer.name} (${statement.signer.id})`,
      )
    }
    if (time(statement.signedAt) < time(listing.createdAt)) {
      problems.push(`it was signed at ${statement.signedAt}, before its key was created at ${listing.createdAt}`)
    }
    if (listing.retiredAt !== null && time(listing.retiredAt) <= time(statement.signedAt)) {
      problems.push(`its key was retired at ${listing.retiredAt}, before it was signed at ${statement.signedAt}`)
    }
  }

  return {
    index,
    signer: statement.signer,
    meaning: statement.meaning,
    signedAt: statement.signedAt,
    keyFingerprint: statement.keyFingerprint,
    ok: false,
    problems,
    registeredKey: null,
  }
}

/**
 * `countersigns` names the countersigned statement by statementHash (covered by the signature)
 * or, failing that, by the envelope's unsigned server `id`.
 */
function checkCountersignature(bundle: RecordBundle, check: SignatureCheck, hashes: string[], standsAlone: boolean[]): void {
  const statement = bundle.signatures[check.index]!.statement
  const reference = statement.countersigns
  if (reference === undefined) {
    if (statement.meaning === 'witnessed') {
      check.problems.push('a witness signature must name the authored signature it countersigns, and countersigns is missing')
    }
    return
  }
  let target = hashes.findIndex((hash, index) => index !== check.index && hash === reference)
  if (target === -1) {
    target = bundle.signatures.findIndex((envelope, index) => index !== check.index && envelope.id === reference)
  }
  if (target === -1) {
    check.problems.push(`it countersigns ${reference}, which is not the statement hash or id of another signature in this bundle`)
    return
  }
  const countersigned = bundle.signatures[target]!.statement
  if (!standsAlone[target]) {
    check.problems.push(`the signature it countersigns, signatures[${target}], is itself not valid`)
  }
  if (time(statement.signedAt) < time(countersigned.signedAt)) {
    check.problems.push(`it was signed at ${statement.signedAt}, before the signature it countersigns (${countersigned.signedAt})`)
  }
  if (statement.meaning !== 'witnessed') return
  if (countersigned.meaning !== 'authored') {
    check.problems.push(`a witness must countersign an authored signature, but signatures[${target}] is ${countersigned.meaning}`)
  }
  if (countersigned.signer.id === statement.signer.id) {
    check.problems.push(`${statement.signer.name} cannot witness their own signature; a witness must be a different person`)
  }
}
