import { and, eq, isNull, ne } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { declineBodySchema } from '#shared/schemas/signing'
import { entries, people, witnessRequests } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** The asked witness declines, with a reason; the author is told by e-mail after the change commits. */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'witness')
  const { id } = await validParams(event, paramsSchema)
  const { reason } = await validBody(event, declineBodySchema)
  const entry = await readableEntry(person, id)
  if (entry.authorId === person.id)
    throw createError({ statusCode: 403, message: 'Nobody witnesses their own entry.' })
  if (!(await isMember(entry.notebookId, person.id)))
    throw createError({ statusCode: 403, message: 'Only a witness who belongs to this notebook decides on its entries.' })
  if (entry.state !== 'awaiting_witness')
    throw createError({ statusCode: 409, message: 'This version is no longer waiting for a witness.' })
  const database = useDatabase()
  const request = await signingOpenRequestFor(database, entry.id, entry.version, person.id)
  if (!request)
    throw createError({ statusCode: 403, message: 'The author has not asked you to witness this version.' })

  const updated = await database.transaction(async (tx) => {
    const current = await signingLockEntry(tx, entry.id)
    if (current.state !== 'awaiting_witness' || current.version !== entry.version)
      throw createError({ statusCode: 409, message: 'This version is no longer waiting for a witness.' })
    const now = new Date()
    const [row] = await tx.update(entries).set({ state: 'declined', lockVersion: current.lockVersion + 1, updatedAt: now })
      .where(eq(entries.id, current.id)).returning()
    await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'declined', reason }).where(eq(witnessRequests.id, request.id))
    await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'closed: declined by another witness' }).where(and(
      eq(witnessRequests.entryId, current.id), eq(witnessRequests.version, current.version),
      isNull(witnessRequests.resolvedAt), ne(witnessRequests.id, request.id),
    ))
    await recordAudit(database, {
      action: 'entry_declined', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
      details: { version: current.version, reason, requestId: request.id },
    }, tx)
    return row!
  })

  const [author] = await database.select({ name: people.name, email: people.email }).from(people).where(eq(people.id, entry.authorId))
  const mailed = await mailSendAudited({
    to: author!.email,
    subject: `Declined: ${entry.title}`,
    text: [
      `${author!.name},`,
      '',
      `${person.name} declined to witness version ${entry.version} of "${entry.title}".`,
      '',
      'Their reason:',
      reason,
      '',
      'You can amend the entry and sign the new version:',
      mailLink(`/entries/${entry.id}`),
      '',
      'Thermotome',
    ].join('\n'),
  }, { actor: person, entryId: entry.id, purpose: 'declined' })

  return { entry: { id: updated.id, state: updated.state, version: updated.version, lockVersion: updated.lockVersion }, mailed }
})
