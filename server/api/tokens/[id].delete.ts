import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { apiTokens } from '../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** Revoke a token that acts for me (withdrawing consent). 404 for a token that is not mine. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const database = useDatabase()
  const mine = and(eq(apiTokens.id, id), eq(apiTokens.actsFor, person.id))
  const revoked = await database.transaction(async (tx) => {
    const [row] = await tx.update(apiTokens).set({ revokedAt: new Date() }).where(and(mine, isNull(apiTokens.revokedAt))).returning()
    if (row) {
      await recordAudit(database, {
        action: 'api_token_revoked', actorId: person.id, actorEmail: person.email, subjectType: 'api_token', subjectId: id, details: { prefix: row.prefix },
      }, tx)
    }
    return row
  })
  if (!revoked) {
    const [exists] = await database.select({ id: apiTokens.id }).from(apiTokens).where(mine).limit(1)
    throw createError(exists ? { statusCode: 409, message: 'This token is already revoked.' } : { statusCode: 404, message: 'No such token of yours.' })
  }
  return { id, revokedAt: revoked.revokedAt }
})
