import { createHash } from 'node:crypto'
import { and, eq, gt, inArray, isNull, lte, or, sql } from 'drizzle-orm'
import {
  SigningStatementSchema,
  buildBundle,
  canonicalJson,
  statementHash,
  verifyBundle,
} from '#shared/records'
import type { RecordBundle, RecordDocument, RegisteredKey, SignatureEnvelope } from '#shared/records'
import type { RecordComparison } from '#shared/records/recheck'
import { attachments, auditEvents, notebooks, people, type Entry, type EntryVersion } from '../database/schema'
import type { Database } from './db'
import { ed25519Verify } from './ed25519'
import { databaseKeyRegistry, registeredKeys } from './keyRegistry'
import { loadRecordsKey } from './recordsKey'

export interface SignatureVerification {
  id: string
  meaning: string
  signer: { id: string, name: string, email: string }
  signedAt: string
  keyFingerprint: string
  ok: boolean
  problems: string[]
  /** For a key that replaced an earlier one: who confirmed it, when and why. */
  confirmation: { confirmedAt: string, confirmedBy: { id: string, name: string, email: string }, reason: string } | null
}

export interface RecordVerification {
  ok: boolean
  entryId: string
  version: number
  checkedAt: string
  recordHash: { signed: string, recomputed: string | null, ok: boolean }
  record: { ok: boolean, problems: string[] }
  /** The calculations recomputed on the server within the record tolerance. */
  calculations: RecordComparison | null
  signatures: SignatureVerification[]
  auditChain: { ok: boolean, checked: number, problem: string | null, checkpoint: { treeSize: number, rootHash: string, signedAt: string } | null }
  /** Where the keys were checked. */
  registry: { checked: boolean, source: string | null }
  problems: string[]
  /** What was not checked and why. */
  notes: string[]
}

const stable = (value: unknown) => {
  try { return canonicalJson(value) }
  catch { return JSON.stringify(value) }
}

const byNameAndHash = (left: { name: string, sha256: string }, right: { name: string, sha256: string }) =>
  left.name < right.name ? -1 : left.name > right.name ? 1 : left.sha256 < right.sha256 ? -1 : left.sha256 > right.sha256 ? 1 : 0

/**
 * Verifies a frozen version from what is stored. The bundle is built from storage and checked
 * by the one verifier, verifyBundle (shared/records/verify.ts: shape, record hash, strict
 * Ed25519 with node:crypto, keys, countersignatures, the calculations recomputed within the
 * record tolerance). Then only what needs the database: the record hash is the one stored
 * for the version, the frozen row is the record's, the files' stored bytes, each stored
 * signature row agrees with its statement, the audit events, and the audit chain. Reports
 * every failure in words; never throws for bad data.
 */
export async function signingVerifyRecord(database: Database, entry: Entry, version: EntryVersion): Promise<RecordVerification> {
  const recordProblems: string[] = []
  const stored = version.record as RecordDocument | undefined
  let bundle: RecordBundle | null = null
  try {
    bundle = await signingBundleOf(database, version)
  }
  catch (error) {
    recordProblems.push(`the stored record could not be read as a bundle: ${error instanceof Error ? error.message : String(error)}`)
  }
  // The trust anchor: every key checked against the registry (registered to the signer, able to sign then).
  const registry = await databaseKeyRegistry(database, bundle?.signatures.map(envelope => envelope.statement.keyFingerprint) ?? [])
  const report = await verifyBundle(bundle, { verifyEd25519: ed25519Verify, registry, trustedRecordsKey: loadRecordsKey()?.fingerprint })

  // The record hash the bundle carries is computed from the stored record: it must be the hash
  // stored (and signed) for this version.
  const recomputed = report.recordHash.computed
  if (recomputed !== null && recomputed !== version.recordHash)
    recordProblems.push(`the stored record has hash ${recomputed}, but ${version.recordHash} was signed for this version`)
  if (stored && typeof stored === 'object') {
    if (stored.entry?.id !== entry.id || stored.entry?.version !== version.version)
      recordProblems.push('the stored record names another entry or version')
    if (stable(stored.entry?.title) !== stable(version.title))
      recordProblems.push('the stored title differs from the one signed')
    if (stable(stored.entry?.content) !== stable(version.content))
      recordProblems.push('the stored content differs from the content signed')
  }

  // The files: those present when the version was frozen are the record's, and their stored
  // bytes still hash to what the record names.
  const files = await signingAttachmentsAt(database, entry.id, version.frozenAt)
  if (stored && stable(files.map(({ name, mediaType, size, sha256 }) => ({ name, mediaType, size, sha256 })).sort(byNameAndHash)) !== stable([...(stored.attachments ?? [])].sort(byNameAndHash)))
    recordProblems.push('the attachments (names, sizes or SHA-256) stored for this version differ from those signed')
  const storedFiles = await database.select({ name: attachments.name, sha256: attachments.sha256, storageKey: attachments.storageKey }).from(attachments)
    .where(and(eq(attachments.entryId, entry.id), lte(attachments.uploadedAt, version.frozenAt), or(isNull(attachments.detachedAt), gt(attachments.detachedAt, version.frozenAt))))
  for (const file of storedFiles) {
    try {
      const raw = await useStorage('attachments').getItemRaw<Buffer | Uint8Array | ArrayBuffer>(file.storageKey)
      if (raw == null) {
        recordProblems.push(`the file ${file.name} is missing from storage`)
        continue
      }
      const bytes = raw instanceof ArrayBuffer ? new Uint8Array(raw) : raw
      if (createHash('sha256').update(bytes).digest('hex') !== file.sha256)
        recordProblems.push(`the stored bytes of ${file.name} no longer match the SHA-256 that was signed`)
    }
    catch (error) {
      recordProblems.push(`the file ${file.name} could not be read: ${error instanceof Error ? error.message : String(error)}`)
    }
  }

  // Each stored signature row against its statement, and its audit event.
  const rows = await signingSignaturesOf(database, version.id)
  const signerIds = [...new Set(rows.map(r => r.signature.signerId))]
  const signers = signerIds.length ? await database.select({ id: people.id, name: people.name, email: people.email }).from(people).where(inArray(people.id, signerIds)) : []
  const audited = rows.length
    ? await database.select({ signatureId: sql<string>`${auditEvents.details}->>'signatureId'`, action: auditEvents.action }).from(auditEvents)
        .where(and(eq(auditEvents.subjectType, 'entry'), eq(auditEvents.subjectId, entry.id), inArray(auditEvents.action, ['entry_signed', 'entry_witnessed'])))
    : []
  const checks: SignatureVerification[] = rows.map(({ signature, key }, index) => {
    const fromBundle = report.signatures[index]
    const problems = [...(fromBundle?.problems ?? [])]
    const parsed = SigningStatementSchema.safeParse(signature.statement)
    if (parsed.success) {
      const statement = parsed.data
      if (statement.signer.id !== signature.signerId || key.personId !== signature.signerId)
        problems.push('the key does not belong to the signer')
      if (statement.meaning !== signature.meaning)
        problems.push(`the statement's meaning (${statement.meaning}) differs from the stored one (${signature.meaning})`)
      if (Date.parse(statement.signedAt) !== signature.signedAt.getTime())
        problems.push('the statement\'s time differs from the stored signing time')
    }
    if (signature.meaning === 'witnessed') {
      const authored = rows.find(r => r.signature.id === signature.countersignsId)
      if (!authored || authored.signature.meaning !== 'authored')
        problems.push('it does not countersign the author\'s signature of this version')
    }
    const expectedAction = signature.meaning === 'authored' ? 'entry_signed' : 'entry_witnessed'
    if (!audited.some(event => event.signatureId === signature.id && event.action === expectedAction))
      problems.push(`the audit trail has no ${expectedAction} event for it`)
    const signer = signers.find(p => p.id === signature.signerId) ?? { id: signature.signerId, name: 'unknown', email: '' }
    const registered = fromBundle?.registeredKey ?? null
    return {
      id: signature.id, meaning: signature.meaning, signer, signedAt: signature.signedAt.toISOString(),
      keyFingerprint: key.fingerprint, ok: problems.length === 0, problems, confirmation: confirmationOf(registered),
    }
  })
  const storedHashes = await Promise.all(rows.map(async ({ signature }) => {
    const parsed = SigningStatementSchema.safeParse(signature.statement)
    return parsed.success && (await statementHash(parsed.data)) === signature.statementHash
  }))
  storedHashes.forEach((matches, index) => {
    if (!matches) {
      checks[index]!.problems.push('the stored statement does not match the statement hash recorded when it was signed')
      checks[index]!.ok = false
    }
  })
  if (!rows.some(r => r.signature.meaning === 'authored'))
    recordProblems.push('the version carries no author signature')
  // The bundle's own problems that are not a signature's (hash, shape, calculations).
  const bundleProblems = report.problems.filter(problem => !problem.startsWith('signatures['))
  const chain = await verifyAuditChain(database)
  const problems = [
    ...recordProblems,
    ...bundleProblems,
    ...checks.flatMap(check => check.problems.map(problem => `${check.meaning} signature by ${check.signer.name}: ${problem}`)),
    ...(chain.ok ? [] : [`audit trail: ${chain.problem?.message ?? 'the chain is broken'}`]),
  ]
  const allRecordProblems = [...recordProblems, ...bundleProblems]
  return {
    ok: problems.length === 0,
    entryId: entry.id,
    version: version.version,
    checkedAt: new Date().toISOString(),
    recordHash: { signed: version.recordHash, recomputed, ok: recomputed === version.recordHash },
    record: { ok: allRecordProblems.length === 0, problems: allRecordProblems },
    calculations: report.calculations,
    signatures: checks,
    auditChain: { ok: chain.ok, checked: chain.checked, problem: chain.problem?.message ?? null, checkpoint: chain.checkpoint },
    registry: report.registry,
    problems,
    notes: report.notes,
  }
}

/** Who confirmed a replacement key, for showing beside its signatures; null for a first key. */
export function confirmationOf(key: RegisteredKey | null): SignatureVerification['confirmation'] {
  if (!key?.replacement || key.confirmedAt === null || key.confirmedBy === null) return null
  return { confirmedAt: key.confirmedAt, confirmedBy: key.confirmedBy, reason: key.confirmationReason ?? '' }
}

/** The RecordBundle of a frozen version: the signed record, its hash, signatures and their public keys. */
export async function signingBundleOf(database: Database, version: EntryVersion): Promise<RecordBundle> {
  const rows = await signingSignaturesOf(database, version.id)
  const ownerIds = [...new Set(rows.map(r => r.key.personId))]
  const owners = ownerIds.length ? await database.select({ id: people.id, name: people.name, email: people.email }).from(people).where(inArray(people.id, ownerIds)) : []
  const keys = new Map(rows.map(r => [r.key.id, r.key]))
  const registered = await registeredKeys(database, [...keys.values()].map(key => key.fingerprint))
  const signaturesOut: SignatureEnvelope[] = rows.map(({ signature, key }) => signingEnvelopeOf(signature, key.publicKey))
  return buildBundle({
    record: version.record as RecordDocument,
    signatures: signaturesOut,
    publicKeys: [...keys.values()].map((key) => {
      // The owner as the key's signatures name them, so an offline check can match signer and owner.
      const named = rows.find(r => r.key.id === key.id)!.signature.statement as { signer?: { id: string, name: string, email: string } }
      const owner = owners.find(p => p.id === key.personId)!
      const confirmation = confirmationOf(registered.find(entry => entry.fingerprint === key.fingerprint) ?? null)
      return {
        fingerprint: key.fingerprint, publicKey: key.publicKey,
        owner: named.signer?.id === owner.id ? named.signer : owner,
        createdAt: key.createdAt.toISOString(), retiredAt: key.retiredAt?.toISOString() ?? null,
        ...(confirmation ? { confirmation } : {}),
      }
    }),
  })
}
