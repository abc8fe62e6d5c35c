import { and, eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { verifyBundle, type VerificationReport } from '#shared/records'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries, entryVersions } from '../database/schema'
import type { Database } from '../utils/db'

/** The key fingerprints the statements name (any shape: the verifier reports a malformed bundle). */
function uploadedFingerprints(bundle: unknown): string[] {
  const signatures = (bundle as { signatures?: unknown } | null)?.signatures
  if (!Array.isArray(signatures)) return []
  return signatures.flatMap((envelope) => {
    const fingerprint = (envelope as { statement?: { keyFingerprint?: unknown } } | null)?.statement?.keyFingerprint
    return typeof fingerprint === 'string' && /^[0-9a-f]{64}$/.test(fingerprint) ? [fingerprint] : []
  })
}

/**
 * A bundle naming an entry stored here must be that entry's stored version: same record hash.
 * A forged bundle reusing a real entry id with another record is refused even if its keys were real.
 */
async function checkAgainstStoredVersion(database: Database, bundle: unknown, report: VerificationReport): Promise<void> {
  const entry = (bundle as { record?: { entry?: { id?: unknown, version?: unknown } } } | null)?.record?.entry
  if (!uuidSchema.safeParse(entry?.id).success || typeof entry?.version !== 'number') return
  const entryId = entry.id as string
  const [stored] = await database.select({ id: entries.id }).from(entries).where(eq(entries.id, entryId)).limit(1)
  if (!stored) {
    report.notes.push(`entry ${entryId} is not stored here, so only the keys were checked against this server's registry`)
    return
  }
  const [version] = await database.select({ recordHash: entryVersions.recordHash }).from(entryVersions)
    .where(and(eq(entryVersions.entryId, entryId), eq(entryVersions.version, entry.version))).limit(1)
  const problem = !version
    ? `entry ${entryId} has no signed version ${entry.version} here: this record was never signed in this Thermotome`
    : version.recordHash !== report.recordHash.computed
      ? `the record is not the stored version ${entry.version} of entry ${entryId}: its hash is ${report.recordHash.computed ?? 'not computable'}, the stored version's is ${version.recordHash}`
      : null
  if (problem) {
    report.problems.push(problem)
    report.ok = false
  }
}

/** The uploaded bytes: a multipart form's `file` field, or the raw body (JSON or PDF); no larger than a data file may be. */
async function uploadedBytes(event: H3Event): Promise<Uint8Array> {
  const body = await readAttachmentRequestBody(event)
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (type.toLowerCase().startsWith('multipart/form-data')) {
    const boundary = multipartBoundary(type)
    const parts = boundary ? parseMultipartBody(body, boundary) : undefined
    if (!parts) validationError([{ path: 'body', message: 'the multipart form could not be read' }], 'body')
    const file = parts.find(part => part.name === 'file')
    if (!file || file.data.length === 0) validationError([{ path: 'file', message: 'choose a bundle (.json) or a record PDF to check' }], 'body')
    return file.data
  }
  if (body.length === 0) validationError([{ path: 'body', message: 'send a bundle (JSON) or a record PDF to check' }], 'body')
  return body
}

/**
 * Checks a record bundle or an exported PDF with the one verifier, against this server's key
 * registry (every key registered to the person its statement names, able to sign then) and,
 * when the entry is stored here, that the record hash is the stored version's: 200 with the
 * report when everything holds, 422 with the report when not.
 */
export default defineEventHandler(async (event) => {
  await requirePerson(event)
  const bytes = await uploadedBytes(event)
  const { source, bundle } = bundleFromUpload(bytes)
  const database = useDatabase()
  const fingerprints = uploadedFingerprints(bundle)
  const registry = await databaseKeyRegistry(database, fingerprints)
  const report = await verifyBundle(bundle, { verifyEd25519: ed25519Verify, registry, trustedRecordsKey: loadRecordsKey()?.fingerprint })
  await checkAgainstStoredVersion(database, bundle, report)
  const entry = (bundle as { record?: { entry?: { id?: unknown, version?: unknown, title?: unknown, notebook?: { name?: unknown } } } } | null)?.record?.entry
  const summary = entry && typeof entry === 'object'
    ? { entryId: String(entry.id ?? ''), version: Number(entry.version ?? 0), title: String(entry.title ?? ''), notebook: String(entry.notebook?.name ?? '') }
    : null
  const answer = { ok: report.ok, source, record: summary, report }
  if (!report.ok) {
    const isBundle = report.signatures.length > 0 || report.recordHash.stated !== null
    throw createError({
      statusCode: 422,
      message: isBundle ? 'Verification failed: the record or its signatures do not hold.' : 'This JSON is not a Thermotome record bundle.',
      data: answer,
    })
  }
  return answer
})
