import { z } from 'zod'
import { recordHash } from './hash'
import {
  AttachmentSchema,
  BUNDLE_SCHEMA,
  CalculationSchema,
  PublicKeyListingSchema,
  RECORD_SCHEMA,
  RecordDocumentSchema,
  RecordEntrySchema,
  SignatureEnvelopeSchema,
  parseOrThrow,
} from './schema'
import type { RecordBundle, RecordDocument } from './schema'

const RecordPartsSchema = z.strictObject({
  entry: RecordEntrySchema,
  attachments: z.array(AttachmentSchema).default([]),
  calculations: z.array(CalculationSchema.extend({ warnings: z.array(z.string()).default([]) })).default([]),
})
/** What buildRecord takes: attachments, calculations and each calculation's warnings may be left out. */
export type RecordParts = z.input<typeof RecordPartsSchema>

/** Orders by UTF-16 code units, like RFC 8785 property sorting; localeCompare would differ by locale. */
function compareCodeUnits(left: string, right: string): number {
  return left < right ? -1 : left > right ? 1 : 0
}

/**
 * Assembles the record of one entry version. Attachments are sorted by name, then sha256, so
 * the hash does not depend on upload or query order; calculations keep the order given, which
 * must be their order in the document. Throws an Error naming each invalid field.
 */
export function buildRecord(parts: RecordParts): RecordDocument {
  const { entry, attachments, calculations } = parseOrThrow(RecordPartsSchema, parts, 'record parts')
  const sortedAttachments = [...attachments].sort(
    (left, right) => compareCodeUnits(left.name, right.name) || compareCodeUnits(left.sha256, right.sha256),
  )
  return parseOrThrow(
    RecordDocumentSchema,
    { schema: RECORD_SCHEMA, entry, attachments: sortedAttachments, calculations },
    'record',
  )
}

export interface BundleParts {
  record: RecordDocument
  signatures: RecordBundle['signatures']
  publicKeys: RecordBundle['publicKeys']
}

/**
 * The export bundle: the record, its hash, the signatures in the order given (chronological)
 * and the public keys they use, sorted by fingerprint.
 */
export async function buildBundle(parts: BundleParts): Promise<RecordBundle> {
  const record = parseOrThrow(RecordDocumentSchema, parts.record, 'record')
  const signatures = parseOrThrow(z.array(SignatureEnvelopeSchema), parts.signatures, 'signatures')
  const publicKeys = parseOrThrow(z.array(PublicKeyListingSchema), parts.publicKeys, 'publicKeys')
  publicKeys.sort((left, right) => compareCodeUnits(left.fingerprint, right.fingerprint))
  return {
    schema: BUNDLE_SCHEMA,
    record,
    recordHash: await recordHash(record),
    signatures,
    publicKeys,
  }
}
