import { and, asc, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { attachments, people } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })
const querySchema = z.object({
  all: z.enum(['0', '1'], { error: 'expected 1 (include removed files) or 0' }).optional(),
})

/** The entry's data files, oldest first; removed (detached) ones only with ?all=1. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const query = validQuery(event, querySchema)
  await readableEntry(person, id)
  const rows = await useDatabase().select({ attachment: attachments, uploader: { id: people.id, name: people.name } })
    .from(attachments)
    .innerJoin(people, eq(people.id, attachments.uploadedBy))
    .where(and(eq(attachments.entryId, id), query.all === '1' ? undefined : isNull(attachments.detachedAt)))
    .orderBy(asc(attachments.uploadedAt), asc(attachments.id))
  return { attachments: rows.map(row => publicAttachment(row.attachment, row.uploader)) }
})
