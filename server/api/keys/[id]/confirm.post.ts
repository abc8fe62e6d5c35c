import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { confirmKeyBodySchema } from '#shared/schemas/signing'
import { people, signingKeys } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * A records officer confirms a person's replacement signing key, saying how they know it is
 * theirs (checked in person, by a call to a known number…). Nobody confirms their own key.
 * 404 unknown key, 409 already confirmed or retired.
 */
export default defineEventHandler(async (event) => {
  const officer = await requireRole(event, 'compliance')
  const { id } = await validParams(event, paramsSchema)
  const { reason } = await validBody(event, confirmKeyBodySchema)
  const database = useDatabase()
  const [key] = await database.select().from(signingKeys).where(eq(signingKeys.id, id)).limit(1)
  if (!key)
    throw createError({ statusCode: 404, message: 'No such signing key.' })
  if (key.personId === officer.id)
    throw createError({ statusCode: 403, message: 'Nobody confirms their own signing key; another records officer does.' })
  if (key.confirmedAt)
    throw createError({ statusCode: 409, message: 'This key is already confirmed.' })
  if (key.retiredAt)
    throw createError({ statusCode: 409, message: 'This key was retired before it was confirmed; it will never sign.' })
  const [owner] = await database.select({ email: people.email }).from(people).where(eq(people.id, key.personId))
  const confirmed = await database.transaction(async (tx) => {
    const [row] = await tx.update(signingKeys).set({ confirmedAt: new Date(), confirmedBy: officer.id, confirmationReason: reason })
      .where(and(eq(signingKeys.id, id), isNull(signingKeys.confirmedAt), isNull(signingKeys.retiredAt))).returning()
    if (!row)
      throw createError({ statusCode: 409, message: 'This key changed meanwhile (confirmed or retired). Reload.' })
    await recordAudit(database, {
      action: 'signing_key_confirmed', actorId: officer.id, actorEmail: officer.email, subjectType: 'signing_key', subjectId: id,
      details: { fingerprint: key.fingerprint, personId: key.personId, personEmail: owner?.email ?? null, reason },
    }, tx)
    return row
  })
  return { key: { id: confirmed.id, fingerprint: confirmed.fingerprint, confirmedAt: confirmed.confirmedAt, confirmedBy: officer.id, confirmationReason: reason } }
})
