import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { versionQuerySchema } from '#shared/schemas/signing'

const paramsSchema = z.object({ id: uuidSchema })

/** Verifies a signed version of an entry (?version=N, default the newest signed one) from what is stored. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const { version: number } = await validQuery(event, versionQuerySchema)
  const entry = await readableEntry(person, id)
  const database = useDatabase()
  const version = await signingFrozenVersion(database, id, number)
  if (!version)
    throw createError({ statusCode: 404, message: number ? `Version ${number} of this entry has not been signed.` : 'This entry has no signed version yet.' })
  const report = await signingVerifyRecord(database, entry, version)
  // A records officer's check is itself part of the record's history (issue 15): who, which version, what came out.
  await recordAudit(database, {
    action: 'record_verified', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: id,
    details: { title: entry.title, version: version.version, outcome: report.ok ? 'verified' : 'failed', recordHash: version.recordHash, ...(report.ok ? {} : { problems: report.problems.slice(0, 5) }) },
  })
  return report
})
