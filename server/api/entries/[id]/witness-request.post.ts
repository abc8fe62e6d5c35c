import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { witnessRequestBodySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The author asks a witness to countersign the signed version. The request is stored and
 * audited in one transaction; the e-mail goes out after it commits (a failed send is audited).
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const { witnessId } = await validBody(event, witnessRequestBodySchema)
  const { request, witness, mailed } = await transitionRequestWitness(person, id, witnessId)
  setResponseStatus(event, 201)
  return {
    request: { id: request.id, version: request.version, requestedAt: request.requestedAt, witness: { id: witness.id, name: witness.name, email: witness.email } },
    mailed,
  }
})
