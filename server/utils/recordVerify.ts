import { createHash } from 'node:crypto'
import { and, eq, gt, inArray, isNull, lte, or, sql } from 'drizzle-orm'
import {
  CalculationBlockError,
  SigningStatementSchema,
  base64ToBytes,
  buildBundle,
  buildEntryRecord,
  canonicalJson,
  describeIssues,
  recordHash as hashRecord,
  statementBytes,
  statementHash,
} from '#shared/records'
import type { RecordBundle, RecordDocument, SignatureEnvelope } from '#shared/records'
import { attachments, auditEvents, notebooks, people, type Entry, type EntryVersion } from '../database/schema'
import type { Database } from './db'
import { ed25519Verify } from './ed25519'

export interface SignatureVerification {
  id: string
  meaning: string
  signer: { id: string, name: string, email: string }
  signedAt: string
  keyFingerprint: string
  ok: boolean
  problems: string[]
}

export interface RecordVerification {
  ok: boolean
  entryId: string
  version: number
  checkedAt: string
  recordHash: { signed: string, recomputed: string | null, ok: boolean }
  record: { ok: boolean, problems: string[] }
  signatures: SignatureVerification[]
  auditChain: { ok: boolean, checked: number, problem: string | null }
  problems: string[]
}

const stable = (value: unknown) => {
  try { return canonicalJson(value) }
  catch { return JSON.stringify(value) }
}

/** Names which part of a rebuilt record differs from the record that was signed. */
function describeRecordDifferences(rebuilt: RecordDocument, stored: RecordDocument | undefined): string[] {
  if (!stored || typeof stored !== 'object') return ['the stored record document is missing or unreadable']
  const differences: string[] = []
  if (stable(rebuilt.entry.title) !== stable(stored.entry?.title)) differences.push('the stored title differs from the one signed')
  if (stable(rebuilt.entry.content) !== stable(stored.entry?.content)) differences.push('the stored content differs from the content signed')
  if (stable(rebuilt.entry.supersedes) !== stable(stored.entry?.supersedes)) differences.push('the version it supersedes differs from the one signed')
  if (stable(rebuilt.attachments) !== stable(stored.attachments)) differences.push('the attachments (names, sizes or SHA-256) differ from those signed')
  const storedCalculations = Array.isArray(stored.calculations) ? stored.calculations : []
  if (rebuilt.calculations.length !== storedCalculations.length)
    differences.push(`the content now has ${rebuilt.calculations.length} calculation blocks, the signed record ${storedCalculations.length}`)
  for (const calculation of rebuilt.calculations) {
    const before = storedCalculations.find(c => c.blockId === calculation.blockId)
    if (!before) continue
    if (stable(before.input) !== stable(calculation.input)) differences.push(`calculation block ${calculation.blockId}: its input differs from the input signed`)
    else if (before.engineVersion !== calculation.engineVersion) differences.push(`calculation block ${calculation.blockId}: signed with engine ${before.engineVersion}, this server runs ${calculation.engineVersion}, so it cannot be recomputed exactly`)
    else if (stable(before.result) !== stable(calculation.result)) differences.push(`calculation block ${calculation.blockId}: the server's engine computes a different result from the one signed`)
  }
  return differences
}

/**
 * Verifies a frozen version from what is stored: rebuilds the record from the stored content,
 * the attachments present when it was frozen and the server's engine, and compares its hash
 * with the signed one; checks every signature (Ed25519 with node:crypto, statement hash, key
 * owner, key active at signing time, countersignature links, the audit event for it); and
 * checks the whole audit chain. Reports every failure in words; never throws for bad data.
 */
export async function signingVerifyRecord(database: Database, entry: Entry, version: EntryVersion): Promise<RecordVerification> {
  const recordProblems: string[] = []
  const stored = version.record as RecordDocument | undefined
  const [notebook] = await database.select({ id: notebooks.id, name: notebooks.name }).from(notebooks).where(eq(notebooks.id, entry.notebookId))
  // The notebook may be renamed after signing: the signed name stands if the id is the same.
  const signedNotebook = stored?.entry?.notebook?.id === notebook!.id ? stored.entry.notebook : notebook!
  const files = await signingAttachmentsAt(database, entry.id, version.frozenAt)

  let recomputed: string | null = null
  try {
    const rebuilt = buildEntryRecord({
      entry: { id: entry.id, title: version.title, content: version.content, version: version.version, supersedesVersion: version.supersedesVersion },
      notebook: signedNotebook,
      attachments: files,
    })
    recomputed = await hashRecord(rebuilt)
    if (recomputed !== version.recordHash) {
      recordProblems.push(`the record rebuilt from what is stored has hash ${recomputed}, but ${version.recordHash} was signed`)
      recordProblems.push(...describeRecordDifferences(rebuilt, stored))
    }
  }
  catch (error) {
    recordProblems.push(error instanceof CalculationBlockError
      ? `the stored content no longer computes: ${error.message}`
      : `the record could not be rebuilt from what is stored: ${error instanceof Error ? error.message : String(error)}`)
  }
  try {
    if (stored && (await hashRecord(stored)) !== version.recordHash)
      recordProblems.push('the stored record document does not match the signed record hash')
  }
  catch {
    recordProblems.push('the stored record document is not a valid record')
  }

  // The files themselves: their stored bytes must still hash to what the record names.
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

  const rows = await signingSignaturesOf(database, version.id)
  const signerIds = [...new Set(rows.map(r => r.signature.signerId))]
  const signers = signerIds.length ? await database.select({ id: people.id, name: people.name, email: people.email }).from(people).where(inArray(people.id, signerIds)) : []
  const audited = rows.length
    ? await database.select({ signatureId: sql<string>`${auditEvents.details}->>'signatureId'`, action: auditEvents.action }).from(auditEvents)
        .where(and(eq(auditEvents.subjectType, 'entry'), eq(auditEvents.subjectId, entry.id), inArray(auditEvents.action, ['entry_signed', 'entry_witnessed'])))
    : []
  const hashes = new Map<string, string>()
  for (const { signature } of rows) {
    const parsed = SigningStatementSchema.safeParse(signature.statement)
    if (parsed.success) hashes.set(signature.id, await statementHash(parsed.data))
  }

  const checks: SignatureVerification[] = []
  for (const { signature, key } of rows) {
    const problems: string[] = []
    const parsed = SigningStatementSchema.safeParse(signature.statement)
    const statement = parsed.success ? parsed.data : undefined
    if (!statement) {
      problems.push(`the stored statement is malformed: ${describeIssues(parsed.error!.issues, 'statement').join('; ')}`)
    }
    else {
      if (!ed25519Verify(statementBytes(statement), base64ToBytes(signature.signature), base64ToBytes(key.publicKey)))
        problems.push('the Ed25519 signature does not verify: the stored statement or signature was changed')
      if (hashes.get(signature.id) !== signature.statementHash)
        problems.push('the stored statement does not match the statement hash recorded when it was signed')
      if (statement.recordHash !== version.recordHash)
        problems.push(`it covers record ${statement.recordHash}, not the version's ${version.recordHash}`)
      if (statement.keyFingerprint !== key.fingerprint)
        problems.push('the statement names another key than the one stored with it')
      if (statement.signer.id !== signature.signerId || key.personId !== signature.signerId)
        problems.push('the key does not belong to the signer')
      if (statement.meaning !== signature.meaning)
        problems.push(`the statement's meaning (${statement.meaning}) differs from the stored one (${signature.meaning})`)
      if (Date.parse(statement.signedAt) !== signature.signedAt.getTime())
        problems.push('the statement\'s time differs from the stored signing time')
    }
    if (key.createdAt.getTime() > signature.signedAt.getTime())
      problems.push(`its key was registered at ${key.createdAt.toISOString()}, after the signature's time`)
    if (key.retiredAt && key.retiredAt.getTime() <= signature.signedAt.getTime())
      problems.push(`its key was retired at ${key.retiredAt.toISOString()}, before the signature's time`)
    if (signature.meaning === 'witnessed') {
      const authored = rows.find(r => r.signature.id === signature.countersignsId)
      if (!authored || authored.signature.meaning !== 'authored')
        problems.push('it does not countersign the author\'s signature of this version')
      else {
        if (statement && statement.countersigns !== hashes.get(authored.signature.id))
          problems.push('it names another statement than the author\'s signature it is stored against')
        if (authored.signature.signerId === signature.signerId)
          problems.push('the witness is the author')
      }
    }
    const expectedAction = signature.meaning === 'authored' ? 'entry_signed' : 'entry_witnessed'
    if (!audited.some(event => event.signatureId === signature.id && event.action === expectedAction))
      problems.push(`the audit trail has no ${expectedAction} event for it`)
    const signer = signers.find(p => p.id === signature.signerId) ?? { id: signature.signerId, name: 'unknown', email: '' }
    checks.push({
      id: signature.id, meaning: signature.meaning, signer, signedAt: signature.signedAt.toISOString(),
      keyFingerprint: key.fingerprint, ok: problems.length === 0, problems,
    })
  }
  if (!rows.some(r => r.signature.meaning === 'authored'))
    recordProblems.push('the version carries no author signature')

  const chain = await verifyAuditChain(database)
  const problems = [
    ...recordProblems,
    ...checks.flatMap(check => check.problems.map(problem => `${check.meaning} signature by ${check.signer.name}: ${problem}`)),
    ...(chain.ok ? [] : [`audit trail: ${chain.problem?.message ?? 'the chain is broken'}`]),
  ]
  return {
    ok: problems.length === 0,
    entryId: entry.id,
    version: version.version,
    checkedAt: new Date().toISOString(),
    recordHash: { signed: version.recordHash, recomputed, ok: recomputed === version.recordHash },
    record: { ok: recordProblems.length === 0, problems: recordProblems },
    signatures: checks,
    auditChain: { ok: chain.ok, checked: chain.checked, problem: chain.problem?.message ?? null },
    problems,
  }
}

/** The RecordBundle of a frozen version: the signed record, its hash, signatures and their public keys. */
export async function signingBundleOf(database: Database, version: EntryVersion): Promise<RecordBundle> {
  const rows = await signingSignaturesOf(database, version.id)
  const ownerIds = [...new Set(rows.map(r => r.key.personId))]
  const owners = ownerIds.length ? await database.select({ id: people.id, name: people.name, email: people.email }).from(people).where(inArray(people.id, ownerIds)) : []
  const keys = new Map(rows.map(r => [r.key.id, r.key]))
  const signaturesOut: SignatureEnvelope[] = rows.map(({ signature, key }) => signingEnvelopeOf(signature, key.publicKey))
  return buildBundle({
    record: version.record as RecordDocument,
    signatures: signaturesOut,
    publicKeys: [...keys.values()].map((key) => {
      // The owner as the key's signatures name them, so an offline check can match signer and owner.
      const named = rows.find(r => r.key.id === key.id)!.signature.statement as { signer?: { id: string, name: string, email: string } }
      const owner = owners.find(p => p.id === key.personId)!
      return {
        fingerprint: key.fingerprint, publicKey: key.publicKey,
        owner: named.signer?.id === owner.id ? named.signer : owner,
        createdAt: key.createdAt.toISOString(), retiredAt: key.retiredAt?.toISOString() ?? null,
      }
    }),
  })
}
