import { desc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { people, signingKeys } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** A person's public keys, retired ones included, for anyone who verifies their signatures. */
export default defineEventHandler(async (event) => {
  await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const database = useDatabase()
  const [owner] = await database.select({ id: people.id, name: people.name, email: people.email }).from(people).where(eq(people.id, id)).limit(1)
  if (!owner)
    throw createError({ statusCode: 404, message: 'No such person.' })
  const keys = await database.select({
    fingerprint: signingKeys.fingerprint, publicKey: signingKeys.publicKey, createdAt: signingKeys.createdAt,
    retiredAt: signingKeys.retiredAt, retiredReason: signingKeys.retiredReason,
    confirmedAt: signingKeys.confirmedAt, confirmedBy: signingKeys.confirmedBy, confirmationReason: signingKeys.confirmationReason,
  }).from(signingKeys).where(eq(signingKeys.personId, id)).orderBy(desc(signingKeys.createdAt))
  return { person: owner, keys }
})
