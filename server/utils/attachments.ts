import { createHash } from 'node:crypto'
import type { H3Event } from 'h3'
import { eq } from 'drizzle-orm'
import { MAX_ATTACHMENT_BYTES } from '#shared/files/policy'
import { attachments, people, type Attachment } from '../database/schema'
import type { SessionPerson } from './auth'

/** Room for the multipart boundaries and part headers around a file of the largest size. */
export const ATTACHMENT_MULTIPART_OVERHEAD = 64 * 1024

/** The storage holding the bytes of data files (mounted in server/plugins/filesStorage.ts). */
export function attachmentStorage() {
  return useStorage('attachments')
}

export function attachmentSha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex')
}

export function attachmentTooLarge(): never {
  throw createError({ statusCode: 413, message: `The file is larger than the ${MAX_ATTACHMENT_BYTES / 1_000_000} MB a data file may have.` })
}

/**
 * Reads the request body, but never more than `limit` bytes: a declared Content-Length over the
 * limit is refused before reading, and a chunked body is cut off (413) as soon as it passes it.
 */
export async function readAttachmentRequestBody(event: H3Event, limit = MAX_ATTACHMENT_BYTES + ATTACHMENT_MULTIPART_OVERHEAD): Promise<Buffer> {
  const declared = Number.parseInt(getRequestHeader(event, 'content-length') ?? '', 10)
  if (Number.isFinite(declared) && declared > limit)
    attachmentTooLarge()
  // Already read (and counted) by server/middleware/bodyLimit.ts: the stream is spent.
  if (Buffer.isBuffer(event._requestBody)) {
    if (event._requestBody.length > limit)
      attachmentTooLarge()
    return event._requestBody
  }
  const body = await readRequestCapped(event, limit)
  if (!body)
    attachmentTooLarge()
  return body
}

/** The attachment as the API shows it (the storage key stays on the server). */
export function publicAttachment(row: Attachment, uploader?: { id: string, name: string } | null) {
  return {
    id: row.id,
    entryId: row.entryId,
    name: row.name,
    mediaType: row.mediaType,
    size: row.size,
    sha256: row.sha256,
    uploadedAt: row.uploadedAt,
    detachedAt: row.detachedAt,
    uploader: uploader ?? { id: row.uploadedBy, name: '' },
  }
}

export type PublicAttachment = ReturnType<typeof publicAttachment>

/** The attachment and its entry if this person may read the entry; otherwise 404. */
export async function readableAttachment(person: SessionPerson, attachmentId: string) {
  const [row] = await useDatabase().select({ attachment: attachments, uploaderName: people.name }).from(attachments)
    .leftJoin(people, eq(people.id, attachments.uploadedBy))
    .where(eq(attachments.id, attachmentId)).limit(1)
  const notFound = () => createError({ statusCode: 404, message: 'No such file, or it is not shared with you.' })
  if (!row)
    throw notFound()
  try {
    const entry = await readableEntry(person, row.attachment.entryId)
    return { attachment: row.attachment, uploaderName: row.uploaderName ?? '', entry }
  }
  catch (error) {
    if ((error as { statusCode?: number }).statusCode === 404)
      throw notFound()
    throw error
  }
}

/**
 * The stored bytes, checked against the SHA-256 recorded at upload. A missing or changed file
 * answers 409 and leaves an audit event: the record no longer has the file it names.
 */
export async function verifiedAttachmentBytes(person: SessionPerson, attachment: Attachment): Promise<Buffer> {
  const stored = await attachmentStorage().getItemRaw<Buffer | Uint8Array | ArrayBuffer>(attachment.storageKey)
  const bytes = stored == null ? undefined : Buffer.from(stored instanceof ArrayBuffer ? new Uint8Array(stored) : stored)
  const actual = bytes ? attachmentSha256(bytes) : null
  if (bytes && actual === attachment.sha256)
    return bytes
  await recordAudit(useDatabase(), {
    action: 'attachment_integrity_failed', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: attachment.entryId,
    details: { attachmentId: attachment.id, name: attachment.name, recordedSha256: attachment.sha256, actualSha256: actual, missing: !bytes },
  })
  throw createError({
    statusCode: 409,
    message: bytes ? 'The stored file no longer matches its recorded hash.' : 'The stored file is missing.',
    data: { recordedSha256: attachment.sha256, actualSha256: actual },
  })
}

/** Refuses a request whose declared size is already over the limit, before anything is read. */
export function refuseOversizedAttachmentRequest(event: H3Event) {
  const declared = Number.parseInt(getRequestHeader(event, 'content-length') ?? '', 10)
  if (Number.isFinite(declared) && declared > MAX_ATTACHMENT_BYTES + ATTACHMENT_MULTIPART_OVERHEAD)
    attachmentTooLarge()
}

