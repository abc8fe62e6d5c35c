import { z } from 'zod'

const size = z.coerce.number({ error: 'expected a tree size (a whole number)' }).int().min(0)
const querySchema = z.object({ first: size, second: size }).refine(query => query.first <= query.second, { message: 'first must not be larger than second', path: ['first'] })

/**
 * A consistency proof (RFC 9162 §2.1.4) between two sizes of the audit log: with two signed
 * checkpoints an auditor checks offline that the later log only appended to the earlier one.
 */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance', 'admin')
  const { first, second } = validQuery(event, querySchema)
  return await auditConsistencyProof(useDatabase(), first, second)
})
