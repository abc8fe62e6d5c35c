import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { declineBodySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/** The asked witness declines, with a reason; the author is told by e-mail. */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'witness')
  const { id } = await validParams(event, paramsSchema)
  const { reason } = await validBody(event, declineBodySchema)
  const { entry, mailed } = await transitionDecline(person, id, reason)
  return { entry: { id: entry.id, state: entry.state, version: entry.version, lockVersion: entry.lockVersion }, mailed }
})
