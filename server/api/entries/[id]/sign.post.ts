import { z } from 'zod'
import { signBodySchema } from '#shared/schemas/signing'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })

/** The author's signature: freezes the version and stores the signature (server/utils/transitions.ts). */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const { envelope } = await validBody(event, signBodySchema)
  const outcome = await transitionSign(person, id, envelope)
  setResponseStatus(event, 201)
  return {
    entry: { id: outcome.entry.id, state: outcome.entry.state, version: outcome.entry.version, lockVersion: outcome.entry.lockVersion },
    version: { version: outcome.version.version, recordHash: outcome.version.recordHash, frozenAt: outcome.version.frozenAt },
    signature: { id: outcome.signature.id, meaning: outcome.signature.meaning, signedAt: outcome.signature.signedAt, statementHash: outcome.statementHash },
  }
})
