import { and, eq, isNull, sql } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { attachments, entries } from '../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * Removes a file from a draft: it is detached, not deleted. The bytes stay, because a signed
 * version of the entry may still name the file.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = validParams(event, paramsSchema)
  const { attachment, uploaderName, entry } = await readableAttachment(person, id)
  lifecycleRequireEditor(person, entry)
  if (attachment.detachedAt)
    return { attachment: publicAttachment(attachment, { id: attachment.uploadedBy, name: uploaderName }) }

  const database = useDatabase()
  const updated = await database.transaction(async (tx) => {
    const current = await lifecycleWithState(tx, await signingLockEntry(tx, entry.id))
    lifecycleRequireEditor(person, current)
    // Database time, like uploadedAt and a version's frozenAt, so verify compares one clock.
    const [row] = await tx.update(attachments).set({ detachedAt: sql`clock_timestamp()` })
      .where(and(eq(attachments.id, id), isNull(attachments.detachedAt))).returning()
    if (!row)
      return undefined
    await recordAudit(database, {
      action: 'attachment_removed', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: entry.id,
      details: { attachmentId: id, name: row.name, sha256: row.sha256 },
    }, tx)
    return row
  })
  return { attachment: publicAttachment(updated ?? { ...attachment }, { id: attachment.uploadedBy, name: uploaderName }) }
})
