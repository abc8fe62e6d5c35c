import { z } from 'zod'
import { canonicalJson } from './canonical'
import { base64ToBytes, hexToBytes, utf8Bytes } from './encoding'
import { strictEd25519, type Ed25519Verify } from './ed25519'
import { sha256Hex } from './hash'
import { formatFingerprint, keyFingerprint } from './keys'
import { merkleLeafHash, verifyInclusion, type Sha256 } from './merkle'
import {
  PersonSchema, RecordsKeyDocumentSchema, Sha256HexSchema, TimestampSchema, base64OfLength, describeIssues,
  type ProvenAuditEvent, type RecordsKeyDocument, type SigningStatement,
} from './schema'

// Trust anchors (DESIGN.md "Trust anchors: who signed, provably"). Signatures prove only that
// some key signed; the key registry says whose key it was, from when to when, and who confirmed
// a replacement. The organisation publishes the registry as a key list signed with its records
// key (an Ed25519 key kept outside the app database), and signs checkpoints of the audit log
// (RFC 9162 tree heads) with the same key. Both are "records-key documents":
//   { payload: <RFC 8785 canonical JSON text>, signature: <Ed25519 over the payload's UTF-8>, recordsKey: <raw public key> }
// so an auditor can check one with OpenSSL alone (docs/trust-anchors.md).

export const KEY_LIST_SCHEMA = 'thermotome.keylist/1'
export const CHECKPOINT_SCHEMA = 'thermotome.checkpoint/1'




/** One registered signing key as the registry knows it. */
export const RegisteredKeySchema = z.strictObject({
  fingerprint: Sha256HexSchema,
  publicKey: base64OfLength(32, 'an Ed25519 public key'),
  owner: PersonSchema,
  createdAt: TimestampSchema,
  retiredAt: TimestampSchema.nullable(),
  retiredReason: z.string().nullable(),
  /** A later key of its owner (not their first): it may sign only once a records officer confirmed it. */
  replacement: z.boolean(),
  confirmedAt: TimestampSchema.nullable(),
  /** The records officer who confirmed a replacement; null for a first key. */
  confirmedBy: PersonSchema.nullable(),
  confirmationReason: z.string().nullable(),
})
export type RegisteredKey = z.infer<typeof RegisteredKeySchema>

export const KeyListSchema = z.strictObject({
  schema: z.literal(KEY_LIST_SCHEMA),
  issuedAt: TimestampSchema,
  /** keyFingerprint() of the records key that signs this list. */
  recordsKey: Sha256HexSchema,
  keys: z.array(RegisteredKeySchema),
})
export type KeyList = z.infer<typeof KeyListSchema>

/** A signed tree head of the audit log: the root of its first `treeSize` events (RFC 9162 §2.1). */
export const CheckpointSchema = z.strictObject({
  schema: z.literal(CHECKPOINT_SCHEMA),
  treeSize: z.int().nonnegative(),
  rootHash: Sha256HexSchema,
  signedAt: TimestampSchema,
  recordsKey: Sha256HexSchema,
})
export type Checkpoint = z.infer<typeof CheckpointSchema>

/** Where verification got its key registry from, for the report. */
export interface KeyRegistry {
  /** "the database" or "key list issued 2025-… signed by records key SHA256:…". */
  source: string
  keys: RegisteredKey[]
}

/** The registry's keys by fingerprint, for a key list that verified. */
export function registryOfKeyList(list: KeyList): KeyRegistry {
  return { source: `the key list issued ${list.issuedAt}, signed by records key ${formatFingerprint(list.recordsKey)}`, keys: list.keys }
}

const time = (iso: string) => Date.parse(iso)

/**
 * THE rule for whether a registered key could make a signature at `signedAt`: it existed, was
 * not yet retired, and was confirmed by then (a first key is confirmed when registered, a
 * replacement when a records officer confirmed it). The server's signingKeyMaySign is this rule
 * for "now" on a stored key. Answers the reasons it could not, in words; empty when it could.
 */
export function keyCouldSignAt(key: RegisteredKey, signedAt: string): string[] {
  const problems: string[] = []
  const at = time(signedAt)
  if (at < time(key.createdAt)) problems.push(`it was signed at ${signedAt}, before key ${formatFingerprint(key.fingerprint)} was registered (${key.createdAt})`)
  if (key.retiredAt !== null && time(key.retiredAt) <= at) problems.push(`key ${formatFingerprint(key.fingerprint)} was retired at ${key.retiredAt}, before it was signed at ${signedAt}`)
  if (key.confirmedAt === null) problems.push(`key ${formatFingerprint(key.fingerprint)} replaced an earlier key and was never confirmed by a records officer, so it could not sign`)
  else if (time(key.confirmedAt) > at) problems.push(`key ${formatFingerprint(key.fingerprint)} was confirmed only at ${key.confirmedAt}, after it signed at ${signedAt}`)
  return problems
}

/**
 * Checks one signing statement's key against the registry: registered, to the person the
 * statement names, the same public key, and able to sign at the statement's time. Returns the
 * registry's entry (for showing who confirmed a replacement) and the problems, each naming the key.
 */
export function registryCheck(registry: KeyRegistry, statement: SigningStatement, publicKey: string): { key: RegisteredKey | null, problems: string[], notes: string[] } {
  const key = registry.keys.find(candidate => candidate.fingerprint === statement.keyFingerprint) ?? null
  if (key === null) {
    return {
      key,
      problems: [`key ${formatFingerprint(statement.keyFingerprint)} is not in the key registry (${registry.source}): nothing shows it belongs to ${statement.signer.name}`],
      notes: [],
    }
  }
  const problems: string[] = []
  const notes: string[] = []
  if (key.publicKey !== publicKey) problems.push(`the registry's key ${formatFingerprint(key.fingerprint)} is not the public key that made this signature`)
  if (key.owner.id !== statement.signer.id) {
    problems.push(`key ${formatFingerprint(key.fingerprint)} is registered to ${key.owner.name} (${key.owner.id}), not to the signer ${statement.signer.name} (${statement.signer.id})`)
  }
  else if (key.owner.name !== statement.signer.name || key.owner.email !== statement.signer.email) {
    notes.push(`the registry now names the owner of key ${formatFingerprint(key.fingerprint)} ${key.owner.name} <${key.owner.email}>; the statement was signed as ${statement.signer.name} <${statement.signer.email}>`)
  }
  problems.push(...keyCouldSignAt(key, statement.signedAt))
  return { key, problems, notes }
}

/** WebCrypto SHA-256, for the Merkle proofs (a handful of hashes per event). */
export const webCryptoSha256: Sha256 = async data => new Uint8Array(await globalThis.crypto.subtle.digest('SHA-256', new Uint8Array(data)))

/** The bytes a records-key document's signature covers: the payload's UTF-8. */
export function recordsKeySignedBytes(payload: string): Uint8Array {
  return utf8Bytes(payload)
}

export type OpenedDocument<T> =
  | { ok: true, content: T, recordsKeyFingerprint: string }
  | { ok: false, problems: string[], recordsKeyFingerprint: string | null }

/**
 * Opens a records-key document: its shape, the Ed25519 signature over the payload (strict rules),
 * a payload that is canonical JSON of the expected shape, and that the payload names the key that
 * signed it. With `trustedRecordsKey` (a fingerprint), also that it is the organisation's key.
 */
export async function openRecordsKeyDocument<T extends { recordsKey: string }>(
  input: unknown,
  schema: z.ZodType<T>,
  what: string,
  verify: Ed25519Verify,
  trustedRecordsKey?: string,
): Promise<OpenedDocument<T>> {
  const parsed = RecordsKeyDocumentSchema.safeParse(input)
  if (!parsed.success) return { ok: false, problems: describeIssues(parsed.error.issues, what), recordsKeyFingerprint: null }
  const document = parsed.data
  const publicKey = base64ToBytes(document.recordsKey)
  const fingerprint = await keyFingerprint(publicKey)
  const problems: string[] = []
  if (!strictEd25519(verify)(recordsKeySignedBytes(document.payload), base64ToBytes(document.signature), publicKey))
    problems.push(`the ${what}'s signature does not verify under the records key it names: it was changed after signing`)
  let content: T | null = null
  try {
    const value: unknown = JSON.parse(document.payload)
    if (canonicalJson(value as never) !== document.payload) problems.push(`the ${what}'s payload is not in RFC 8785 canonical form`)
    const shaped = schema.safeParse(value)
    if (!shaped.success) problems.push(...describeIssues(shaped.error.issues, `${what}.payload`))
    else content = shaped.data
  }
  catch {
    problems.push(`the ${what}'s payload is not JSON`)
  }
  if (content !== null && content.recordsKey !== fingerprint)
    problems.push(`the ${what} names records key ${formatFingerprint(content.recordsKey)} but was signed with ${formatFingerprint(fingerprint)}`)
  if (trustedRecordsKey !== undefined && fingerprint !== trustedRecordsKey)
    problems.push(`the ${what} is signed by records key ${formatFingerprint(fingerprint)}, not by the organisation's records key ${formatFingerprint(trustedRecordsKey)}`)
  if (problems.length > 0 || content === null) return { ok: false, problems, recordsKeyFingerprint: fingerprint }
  return { ok: true, content, recordsKeyFingerprint: fingerprint }
}

// ---------------------------------------------------------------------------------------
// Audit events carried in a bundle, with their inclusion proofs against a checkpoint.

/** previousHash of the first event in the chain. */
export const AUDIT_GENESIS_HASH = '0'.repeat(64)

export interface AuditEventFields {
  occurredAt: string
  actorId: string | null
  actorEmail: string | null
  action: string
  subjectType: string | null
  subjectId: string | null
  details: unknown
  previousHash: string
}

/** The text an audit event's hash covers: RFC 8785 canonical JSON of its fields (server/database/audit-chain.ts hashes it). */
export function auditEventHashPayload(row: AuditEventFields): string {
  return canonicalJson({
    occurredAt: row.occurredAt,
    actorId: row.actorId ?? null,
    actorEmail: row.actorEmail ?? null,
    action: row.action,
    subjectType: row.subjectType ?? null,
    subjectId: row.subjectId ?? null,
    details: (row.details ?? {}) as never,
    previousHash: row.previousHash,
  })
}


export interface AuditProofReport {
  /** The checkpoint that anchors the events, if any verified. */
  checkpoint: Checkpoint | null
  events: number
  /** Events proven to be in the signed tree head. */
  proven: number
  problems: string[]
  notes: string[]
}

/**
 * Checks the audit events a bundle carries: each event's hash is its contents' hash, and, with
 * a checkpoint signed by the records key, each event is in the audit log that checkpoint signs
 * (RFC 9162 §2.1.3.2 inclusion proofs). `signatureIds` are the bundle's signature ids, each of
 * which must have its signing event among the events.
 */
export async function checkAuditEvents(
  events: ProvenAuditEvent[],
  checkpointDocument: RecordsKeyDocument | null,
  verify: Ed25519Verify,
  trustedRecordsKey: string | undefined,
  signatureIds: string[],
): Promise<AuditProofReport> {
  const problems: string[] = []
  const notes: string[] = []
  let checkpoint: Checkpoint | null = null
  if (checkpointDocument === null) {
    if (events.length > 0) notes.push('the audit events carry no checkpoint, so nothing outside the database vouches for them')
  }
  else {
    const opened = await openRecordsKeyDocument(checkpointDocument, CheckpointSchema, 'checkpoint', verify, trustedRecordsKey)
    if (opened.ok) checkpoint = opened.content
    else problems.push(...opened.problems.map(problem => `audit checkpoint: ${problem}`))
  }
  let proven = 0
  for (const event of events) {
    const label = `audit event ${event.sequence} (${event.action})`
    const hash = await sha256Hex(auditEventHashPayload(event))
    if (hash !== event.hash) {
      problems.push(`${label}: its contents do not match its hash (it was changed)`)
      continue
    }
    if (checkpoint === null) continue
    if (event.leafIndex >= checkpoint.treeSize) {
      notes.push(`${label} is newer than the checkpoint (tree size ${checkpoint.treeSize}) and is not yet anchored`)
      continue
    }
    const leaf = await merkleLeafHash(webCryptoSha256, hexToBytes(event.hash))
    const included = await verifyInclusion(webCryptoSha256, event.leafIndex, checkpoint.treeSize, leaf, event.proof.map(hexToBytes), hexToBytes(checkpoint.rootHash))
    if (included) proven++
    else problems.push(`${label}: its inclusion proof does not lead to the checkpoint's root ${checkpoint.rootHash} (tree size ${checkpoint.treeSize}): the audit log was rewritten, or the event is not from it`)
  }
  for (const id of signatureIds) {
    if (!events.some(event => (event.action === 'entry_signed' || event.action === 'entry_witnessed') && (event.details as { signatureId?: unknown }).signatureId === id))
      problems.push(`the audit events carried have no signing event for signature ${id}`)
  }
  return { checkpoint, events: events.length, proven, problems, notes }
}
