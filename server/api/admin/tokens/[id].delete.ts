import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { apiTokens } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** Revoke a token. The row stays (with revokedAt) so the audit trail can name it. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, paramsSchema)
  const database = useDatabase()
  const revoked = await database.transaction(async (tx) => {
    const [row] = await tx.update(apiTokens).set({ revokedAt: new Date() })
      .where(and(eq(apiTokens.id, id), isNull(apiTokens.revokedAt))).returning()
    if (row) {
      await recordAudit(database, {
        action: 'api_token_revoked', actorId: admin.id, actorEmail: admin.email, subjectType: 'api_token', subjectId: id, details: { prefix: row.prefix },
      }, tx)
    }
    return row
  })
  if (!revoked) {
    const [exists] = await database.select({ id: apiTokens.id }).from(apiTokens).where(eq(apiTokens.id, id)).limit(1)
    throw createError(exists ? { statusCode: 409, message: 'This token is already revoked.' } : { statusCode: 404, message: 'No such token.' })
  }
  return { id, revokedAt: revoked.revokedAt }
})
