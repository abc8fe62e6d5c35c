import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { signBodySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * A witness's countersignature ("read and understood") on the signed version. Two witnesses at
 * once: the entry row lock and the unique index signatures_one_witness let exactly one through.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'witness')
  const { id } = await validParams(event, paramsSchema)
  const { envelope, acknowledgedDifferences } = await validBody(event, signBodySchema)
  const outcome = await transitionCountersign(person, id, envelope, acknowledgedDifferences)
  setResponseStatus(event, 201)
  return {
    entry: { id: outcome.entry.id, state: outcome.entry.state, version: outcome.entry.version, lockVersion: outcome.entry.lockVersion },
    signature: { id: outcome.signature.id, meaning: outcome.signature.meaning, signedAt: outcome.signature.signedAt, statementHash: outcome.statementHash, countersigns: outcome.countersigns },
  }
})
