import { desc, eq } from 'drizzle-orm'
import { apiTokens } from '../../database/schema'

/** The API tokens acting for me (whoever issued them), newest first; never the token itself. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const tokens = await useDatabase().select({
    id: apiTokens.id, name: apiTokens.name, prefix: apiTokens.prefix, scopes: apiTokens.scopes, createdBy: apiTokens.createdBy,
    createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt, revokedAt: apiTokens.revokedAt,
  }).from(apiTokens).where(eq(apiTokens.actsFor, person.id)).orderBy(desc(apiTokens.createdAt))
  return { tokens: tokens.map(token => ({ ...token, madeByMe: token.createdBy === person.id })) }
})
