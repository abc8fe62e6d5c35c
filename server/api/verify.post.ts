import type { H3Event } from 'h3'
import { verifyBundle } from '#shared/records'

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
 * Checks a record bundle or an exported PDF from its own contents, as the command-line check
 * does: 200 with the report when every signature holds, 422 with the report when not.
 */
export default defineEventHandler(async (event) => {
  await requirePerson(event)
  const bytes = await uploadedBytes(event)
  const { source, bundle } = bundleFromUpload(bytes)
  const report = await verifyBundle(bundle, { verifyEd25519: ed25519Verify })
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
