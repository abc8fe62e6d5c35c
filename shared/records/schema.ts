import { z } from 'zod'
import { base64ToBytes } from './encoding'
import { VERSION_STATUSES } from './lifecycle'

// Shapes of the signed record (DESIGN.md, "The signed record"). Objects are strict: an
// unexpected property in something that is hashed or signed is named as a problem, never
// silently dropped or silently signed.

export const RECORD_SCHEMA = 'thermotome.record/1'
export const STATEMENT_SCHEMA = 'thermotome.statement/1'
export const BUNDLE_SCHEMA = 'thermotome.bundle/1'
export const SIGNING_MEANINGS = ['authored', 'witnessed', 'reviewed'] as const

/**
 * OWASP Password Storage Cheat Sheet (2023) minimum for PBKDF2-HMAC-SHA-256. Below this a
 * stolen sealed key is cheap to brute-force, so such a key is refused rather than opened.
 */
export const MIN_PBKDF2_ITERATIONS = 600_000
/** Upper bound, so a stored value cannot make a browser spin for minutes. */
export const MAX_PBKDF2_ITERATIONS = 10_000_000

const text = z.string().min(1, 'must not be empty')

export const Sha256HexSchema = z
  .string()
  .regex(/^[0-9a-f]{64}$/, 'expected a SHA-256 as 64 lower-case hexadecimal digits')

/** Base64 (RFC 4648 §4) that decodes to exactly `length` bytes. */
export function base64OfLength(length: number, what: string) {
  return z.string().refine((value) => {
    try {
      return base64ToBytes(value).length === length
    } catch {
      return false
    }
  }, `expected ${what}: ${length} bytes in standard padded base64`)
}

export const TimestampSchema = z.iso.datetime({
  error: 'expected an ISO 8601 UTC time such as 2025-03-01T12:00:00.000Z',
})

export const PersonSchema = z.strictObject({ id: text, name: text, email: text })
export type Person = z.infer<typeof PersonSchema>

/** Editor JSON (TipTap document) or any other JSON object. */
export const JsonObjectSchema = z.record(z.string(), z.json())

export const AttachmentSchema = z.strictObject({
  name: text,
  mediaType: text,
  size: z.int().nonnegative(),
  sha256: Sha256HexSchema,
})
export type Attachment = z.infer<typeof AttachmentSchema>

export const CalculationSchema = z.strictObject({
  blockId: text,
  kind: text,
  input: z.json(),
  result: z.json(),
  engineVersion: text,
  warnings: z.array(z.string()),
})
export type Calculation = z.infer<typeof CalculationSchema>

export const RecordEntrySchema = z
  .strictObject({
    id: text,
    notebook: z.strictObject({ id: text, name: z.string() }),
    version: z.int().positive(),
    supersedes: z.int().positive().nullable(),
    title: z.string(),
    content: JsonObjectSchema,
  })
  .refine((entry) => entry.supersedes === null || entry.supersedes < entry.version, {
    message: 'supersedes must name an earlier version than this one',
    path: ['supersedes'],
  })
export type RecordEntry = z.infer<typeof RecordEntrySchema>

export const RecordDocumentSchema = z.strictObject({
  schema: z.literal(RECORD_SCHEMA),
  entry: RecordEntrySchema,
  attachments: z.array(AttachmentSchema),
  calculations: z.array(CalculationSchema),
})
export type RecordDocument = z.infer<typeof RecordDocumentSchema>

export const SigningMeaningSchema = z.enum(SIGNING_MEANINGS)
export type SigningMeaning = z.infer<typeof SigningMeaningSchema>

export const SigningStatementSchema = z.strictObject({
  schema: z.literal(STATEMENT_SCHEMA),
  recordHash: Sha256HexSchema,
  signer: PersonSchema,
  /** keyFingerprint() of the signing key: 64 lower-case hex digits, not the display form. */
  keyFingerprint: Sha256HexSchema,
  meaning: SigningMeaningSchema,
  statement: text,
  signedAt: TimestampSchema,
  challenge: text,
  /**
   * For a witness or review: statementHash() of the statement it countersigns (preferred — it
   * is covered by the signature and checkable offline), or the `id` of that signature envelope.
   */
  countersigns: text.optional(),
})
export type SigningStatement = z.infer<typeof SigningStatementSchema>

export const SignatureEnvelopeSchema = z.strictObject({
  statement: SigningStatementSchema,
  /** Ed25519 detached signature over the UTF-8 of canonicalJson(statement). */
  signature: base64OfLength(64, 'an Ed25519 signature'),
  publicKey: base64OfLength(32, 'an Ed25519 public key'),
  /** Optional server id of this signature; not signed, only used to resolve `countersigns`. */
  id: text.optional(),
})
export type SignatureEnvelope = z.infer<typeof SignatureEnvelopeSchema>

export const PublicKeyListingSchema = z.strictObject({
  fingerprint: Sha256HexSchema,
  publicKey: base64OfLength(32, 'an Ed25519 public key'),
  owner: PersonSchema,
  createdAt: TimestampSchema,
  retiredAt: TimestampSchema.nullable(),
  /**
   * For a key that replaced an earlier one: who confirmed it, when and why (shown beside every
   * signature it made). Informative: verification takes these facts from the key registry.
   */
  confirmation: z.strictObject({ confirmedAt: TimestampSchema, confirmedBy: PersonSchema, reason: z.string() }).optional(),
})
export type PublicKeyListing = z.infer<typeof PublicKeyListingSchema>

/**
 * A document signed with the organisation's records key (shared/records/anchor.ts): the payload
 * is RFC 8785 canonical JSON text, the signature Ed25519 over its UTF-8.
 */
export const RecordsKeyDocumentSchema = z.strictObject({
  payload: z.string().min(2),
  signature: base64OfLength(64, 'an Ed25519 signature'),
  recordsKey: base64OfLength(32, 'an Ed25519 public key'),
})
export type RecordsKeyDocument = z.infer<typeof RecordsKeyDocumentSchema>

/** An audit event of the record as exported, with its RFC 9162 inclusion proof in the bundle's checkpoint. */
export const ProvenAuditEventSchema = z.strictObject({
  sequence: z.int().positive(),
  occurredAt: TimestampSchema,
  actorId: z.string().nullable(),
  actorEmail: z.string().nullable(),
  /** The actor's name when exported (not covered by the event's hash). */
  actorName: z.string().nullable(),
  action: z.string(),
  subjectType: z.string().nullable(),
  subjectId: z.string().nullable(),
  details: JsonObjectSchema,
  previousHash: Sha256HexSchema,
  hash: Sha256HexSchema,
  /** Position in the audit log from 0: the Merkle leaf index. */
  leafIndex: z.int().nonnegative(),
  /** Inclusion proof (hex node hashes) of this event in the checkpoint's tree; empty when not anchored. */
  proof: z.array(Sha256HexSchema),
})
export type ProvenAuditEvent = z.infer<typeof ProvenAuditEventSchema>

/**
 * What an export adds to the signed parts, so that the PDF is a function of the bundle alone:
 * the version's state, the entry's audit events with their proofs, and the newest checkpoint
 * of the audit log signed with the records key. Not covered by any person's signature; the
 * audit events are anchored by the checkpoint.
 */
export const ExportContextSchema = z.strictObject({
  state: z.enum(VERSION_STATUSES),
  auditEvents: z.array(ProvenAuditEventSchema),
  checkpoint: RecordsKeyDocumentSchema.nullable(),
})
export type ExportContext = z.infer<typeof ExportContextSchema>

export const RecordBundleSchema = z.strictObject({
  schema: z.literal(BUNDLE_SCHEMA),
  record: RecordDocumentSchema,
  recordHash: Sha256HexSchema,
  signatures: z.array(SignatureEnvelopeSchema),
  publicKeys: z.array(PublicKeyListingSchema),
  context: ExportContextSchema.optional(),
})
export type RecordBundle = z.infer<typeof RecordBundleSchema>

export const SealedKeySchema = z.strictObject({
  kdf: z.literal('PBKDF2-SHA-256'),
  iterations: z
    .int()
    .min(
      MIN_PBKDF2_ITERATIONS,
      `fewer than ${MIN_PBKDF2_ITERATIONS} PBKDF2 iterations (the OWASP minimum) makes the passphrase cheap to guess; seal the key again`,
    )
    .max(MAX_PBKDF2_ITERATIONS, `more than ${MAX_PBKDF2_ITERATIONS} PBKDF2 iterations would stall the browser`),
  salt: base64OfLength(16, 'a PBKDF2 salt'),
  nonce: base64OfLength(24, 'a secretbox nonce'),
  // 64-byte Ed25519 secret key + 16-byte Poly1305 tag.
  sealed: base64OfLength(80, 'a sealed Ed25519 secret key'),
})
export type SealedKey = z.infer<typeof SealedKeySchema>

/** "bundle.record.entry.version: expected number, received string" — one line per zod issue. */
export function describeIssues(issues: readonly z.core.$ZodIssue[], root: string): string[] {
  return issues.map((issue) => {
    let path = root
    for (const key of issue.path) {
      path += typeof key === 'number' ? `[${key}]` : `.${String(key)}`
    }
    return `${path}: ${issue.message.replace(/^Invalid input: /, '')}`
  })
}

/** Parses or throws one Error whose message names every offending field. */
export function parseOrThrow<Schema extends z.ZodType>(schema: Schema, value: unknown, root: string): z.infer<Schema> {
  const result = schema.safeParse(value)
  if (!result.success) throw new Error(describeIssues(result.error.issues, root).join('; '))
  return result.data
}
