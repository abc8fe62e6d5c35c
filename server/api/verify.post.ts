import { verifyBundle } from '#shared/records'

const MAX_BYTES = 25 * 1024 * 1024

/** The uploaded bytes: a multipart form's `file` field, or the raw body (JSON or PDF). */
async function uploadedBytes(event: Parameters<typeof readRawBody>[0]): Promise<Uint8Array> {
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (length > MAX_BYTES)
    throw createError({ statusCode: 413, message: `file: larger than ${MAX_BYTES / 1024 / 1024} MB` })
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (type.startsWith('multipart/form-data')) {
    const parts = await readMultipartFormData(event)
    const file = parts?.find(part => part.name === 'file')
    if (!file || file.data.length === 0) validationError([{ path: 'file', message: 'choose a bundle (.json) or a record PDF to check' }], 'body')
    return file.data
  }
  const body = await readRawBody(event, false)
  if (!body || body.length === 0) validationError([{ path: 'body', message: 'send a bundle (JSON) or a record PDF to check' }], 'body')
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
  const report = await verifyBundle(bundle)
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
