import { desc, eq } from 'drizzle-orm'
import { signingKeys } from '../../database/schema'

/** My signing keys, newest first, retired ones included; the sealed secret is only ever shown to its owner. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const keys = await useDatabase().select().from(signingKeys).where(eq(signingKeys.personId, person.id)).orderBy(desc(signingKeys.createdAt))
  return {
    keys: keys.map(key => ({
      id: key.id, fingerprint: key.fingerprint, publicKey: key.publicKey, sealedSecretKey: key.sealedSecretKey,
      createdAt: key.createdAt, retiredAt: key.retiredAt, retiredReason: key.retiredReason,
      confirmedAt: key.confirmedAt, confirmationReason: key.confirmationReason, pending: key.confirmedAt === null && key.retiredAt === null,
    })),
    active: keys.find(key => key.retiredAt === null)?.id ?? null,
  }
})
