import { desc, eq } from 'drizzle-orm'
import { apiTokens, people } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const rows = await useDatabase().select({
    id: apiTokens.id, name: apiTokens.name, prefix: apiTokens.prefix, scopes: apiTokens.scopes,
    createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt, revokedAt: apiTokens.revokedAt,
    actsFor: { id: people.id, name: people.name, email: people.email },
  }).from(apiTokens).innerJoin(people, eq(people.id, apiTokens.actsFor)).orderBy(desc(apiTokens.createdAt))
  return { tokens: rows }
})
