import { randomUUID } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { checkAttachmentContent, MAX_ATTACHMENT_BYTES, sanitiseAttachmentName } from '#shared/files/policy'
import { uuidSchema } from '#shared/schemas/notebooks'
import { attachments, entries } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** Attach a data file (multipart/form-data, field `file`) to a draft entry of one's own. */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = validParams(event, paramsSchema)
  refuseOversizedAttachmentRequest(event)
  if (!(getRequestHeader(event, 'content-type') ?? '').toLowerCase().startsWith('multipart/form-data'))
    validationError([{ path: 'file', message: 'send the file as multipart/form-data in a field named "file"' }], 'body')
  const entry = await readableEntry(person, id)
  lifecycleRequireEditor(person, entry)

  const boundary = multipartBoundary(getRequestHeader(event, 'content-type'))
  if (!boundary)
    validationError([{ path: 'file', message: 'the multipart/form-data request names no boundary' }], 'body')
  const parts = parseMultipartBody(await readAttachmentRequestBody(event), boundary)
  if (!parts)
    validationError([{ path: 'file', message: 'the multipart/form-data body is cut short or malformed' }], 'body')
  const part = parts.find(item => item.name === 'file')
  if (!part || part.filename === undefined)
    validationError([{ path: 'file', message: 'expected a file in the form field "file"' }], 'body')
  if (part.data.length > MAX_ATTACHMENT_BYTES)
    attachmentTooLarge()
  if (part.data.length === 0)
    validationError([{ path: 'file', message: 'the file is empty' }], 'body')
  const name = sanitiseAttachmentName(part.filename)
  const check = checkAttachmentContent(name, part.data)
  if (!check.ok)
    throw createError({ statusCode: 415, message: check.reason })

  const sha256 = attachmentSha256(part.data)
  const storageKey = `${entry.id}/${randomUUID()}`
  const database = useDatabase()
  let row
  try {
    // Inside the try: a write cut short (full disk) must not leave a partial file behind.
    await attachmentStorage().setItemRaw(storageKey, part.data)
    row = await database.transaction(async (tx) => {
      // Lock the entry so that it cannot be signed between the check above and this insert.
      const current = await lifecycleWithState(tx, await signingLockEntry(tx, entry.id))
      lifecycleRequireEditor(person, current)
      const [inserted] = await tx.insert(attachments).values({
        entryId: entry.id, name, storageKey, mediaType: check.mediaType, size: part.data.length, sha256, uploadedBy: person.id,
      }).returning()
      await recordAudit(database, {
        action: 'attachment_added', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: entry.id,
        details: { attachmentId: inserted!.id, name, mediaType: check.mediaType, size: inserted!.size, sha256 },
      }, tx)
      return inserted!
    })
  }
  catch (error) {
    await attachmentStorage().removeItem(storageKey).catch(() => {})
    throw error
  }
  setResponseStatus(event, 201)
  return { attachment: publicAttachment(row, { id: person.id, name: person.name }) }
})
