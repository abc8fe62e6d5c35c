import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })
const bodySchema = z.object({
  reason: z.string({ error: 'expected text' }).trim().max(2000, 'at most 2000 characters').optional(),
})

/** Starts an amendment: a new draft version that names the signed version it supersedes. */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const { reason } = await validBody(event, bodySchema)
  const entry = await transitionAmend(person, id, reason)
  setResponseStatus(event, 201)
  return { entry }
})
