import { eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { setMembersSchema, uuidSchema } from '#shared/schemas/notebooks'
import { notebookMembers, notebooks, people } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, paramsSchema)
  const { memberIds: requested } = await validBody(event, setMembersSchema)
  const database = useDatabase()
  const [notebook] = await database.select().from(notebooks).where(eq(notebooks.id, id)).limit(1)
  if (!notebook)
    throw createError({ statusCode: 404, message: 'No such notebook.' })
  const memberIds = [...new Set(requested)]
  if (memberIds.length) {
    const found = await database.select({ id: people.id }).from(people).where(inArray(people.id, memberIds))
    const missing = memberIds.filter(m => !found.some(f => f.id === m))
    if (missing.length)
      validationError([{ path: 'memberIds', message: `no such person: ${missing.join(', ')}` }], 'body')
  }
  await database.transaction(async (tx) => {
    // Lock the notebook so that two member changes at once run one after the other (otherwise
    // both delete, both insert, and the second insert collides).
    await tx.select({ id: notebooks.id }).from(notebooks).where(eq(notebooks.id, id)).for('update')
    const before = (await tx.select({ personId: notebookMembers.personId }).from(notebookMembers).where(eq(notebookMembers.notebookId, id))).map(r => r.personId)
    await tx.delete(notebookMembers).where(eq(notebookMembers.notebookId, id))
    if (memberIds.length)
      await tx.insert(notebookMembers).values(memberIds.map(personId => ({ notebookId: id, personId })))
    await recordAudit(database, {
      action: 'notebook_members_changed', actorId: admin.id, actorEmail: admin.email, subjectType: 'notebook', subjectId: id,
      details: { added: memberIds.filter(m => !before.includes(m)), removed: before.filter(m => !memberIds.includes(m)) },
    }, tx)
  })
  return { notebookId: id, memberIds }
})
