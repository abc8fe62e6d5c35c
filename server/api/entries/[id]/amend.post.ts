import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries, witnessRequests } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })
const bodySchema = z.object({
  reason: z.string({ error: 'expected text' }).trim().max(2000, 'at most 2000 characters').optional(),
})

/**
 * Starts an amendment: the signed version stays frozen (and is shown as superseded); the entry
 * becomes a new draft version that names the version it supersedes.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const { reason } = await validBody(event, bodySchema)
  const entry = await readableEntry(person, id)
  if (entry.authorId !== person.id)
    throw createError({ statusCode: 403, message: 'Only the author amends an entry.' })
  if (entry.state === 'draft' || entry.state === 'superseded')
    throw createError({ statusCode: 409, message: 'Only a signed version is amended; a draft is simply edited.' })
  const database = useDatabase()
  const updated = await database.transaction(async (tx) => {
    const current = await signingLockEntry(tx, entry.id)
    if (current.state === 'draft' || current.state === 'superseded' || current.version !== entry.version)
      throw createError({ statusCode: 409, message: 'This entry changed meanwhile. Reload it.' })
    const now = new Date()
    const [row] = await tx.update(entries).set({
      state: 'draft', version: current.version + 1, supersedesVersion: current.version,
      lockVersion: current.lockVersion + 1, updatedAt: now,
    }).where(eq(entries.id, current.id)).returning()
    await tx.update(witnessRequests).set({ resolvedAt: now, outcome: 'closed: amended' }).where(and(
      eq(witnessRequests.entryId, current.id), eq(witnessRequests.version, current.version), isNull(witnessRequests.resolvedAt),
    ))
    await recordAudit(database, {
      action: 'entry_amended', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: current.id,
      details: { supersedes: current.version, version: current.version + 1, previousState: current.state, reason: reason || null },
    }, tx)
    return row!
  })
  setResponseStatus(event, 201)
  return { entry: updated }
})
