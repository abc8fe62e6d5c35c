import { and, asc, eq, isNull } from 'drizzle-orm'
import { people, signingKeys } from '../../database/schema'

/** Replacement signing keys waiting for a records officer's confirmation, oldest first. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance')
  const keys = await useDatabase().select({
    id: signingKeys.id, fingerprint: signingKeys.fingerprint, createdAt: signingKeys.createdAt,
    person: { id: people.id, name: people.name, email: people.email },
  }).from(signingKeys).innerJoin(people, eq(people.id, signingKeys.personId))
    .where(and(isNull(signingKeys.confirmedAt), isNull(signingKeys.retiredAt))).orderBy(asc(signingKeys.createdAt))
  return { keys }
})
