import { and, desc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { openActions } from '#shared/records/lifecycle'
import { uuidSchema } from '#shared/schemas/notebooks'
import { people, witnessRequests } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * What the record panel needs: the entry's signing state, the witness requests this person may
 * see (all for the author, their own for a witness) and which actions are open to them. The
 * actions are a convenience for the page; every action route checks again.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const entry = await readableEntry(person, id)
  const database = useDatabase()
  const isAuthor = entry.authorId === person.id
  const requests = await database.select({
    id: witnessRequests.id, version: witnessRequests.version, requestedAt: witnessRequests.requestedAt,
    resolvedAt: witnessRequests.resolvedAt, outcome: witnessRequests.outcome, reason: witnessRequests.reason,
    witness: { id: people.id, name: people.name, email: people.email },
  }).from(witnessRequests).innerJoin(people, eq(people.id, witnessRequests.witnessId))
    .where(and(eq(witnessRequests.entryId, id), ...(isAuthor || readsAllNotebooks(person) ? [] : [eq(witnessRequests.witnessId, person.id)])))
    .orderBy(desc(witnessRequests.requestedAt)).limit(100)
  const latest = await signingFrozenVersion(database, id)
  const key = await signingActiveKey(database, person.id)
  const can = openActions(person, await lifecycleEntryFor(person, entry))
  return {
    entry: { id: entry.id, state: entry.state, version: entry.version, supersedesVersion: entry.supersedesVersion, lockVersion: entry.lockVersion },
    isAuthor,
    latestFrozenVersion: latest?.version ?? null,
    activeKey: key ? { id: key.id, fingerprint: key.fingerprint } : null,
    requests,
    can: {
      sign: can.sign,
      requestWitness: can.requestWitness,
      amend: can.amend,
      countersign: can.countersign,
      decline: can.decline,
    },
  }
})
