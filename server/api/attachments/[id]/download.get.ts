import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })

/** RFC 6266 Content-Disposition with the RFC 5987 UTF-8 form and an ASCII fallback. */
function contentDisposition(name: string): string {
  const fallback = name.replace(/[^\x20-\x7E]/g, '_').replace(/["\\]/g, '_')
  const encoded = encodeURIComponent(name).replace(/['()*]/g, character => `%${character.charCodeAt(0).toString(16).toUpperCase()}`)
  return `attachment; filename="${fallback}"; filename*=UTF-8''${encoded}`
}

/** The file's bytes as a download, checked against the recorded SHA-256 on the way out. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const { attachment } = await readableAttachment(person, id)
  const bytes = await verifiedAttachmentBytes(person, attachment)
  setResponseHeaders(event, {
    'content-type': attachment.mediaType.startsWith('text/') ? `${attachment.mediaType}; charset=utf-8` : attachment.mediaType,
    'content-length': bytes.length,
    'content-disposition': contentDisposition(attachment.name),
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
    'content-security-policy': "default-src 'none'; sandbox; frame-ancestors 'none'",
    'x-thermotome-sha256': attachment.sha256,
  })
  return bytes
})
