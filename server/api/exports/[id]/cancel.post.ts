import { and, eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { exportJobs } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** Cancels a queued or running export; the runner stops before its next record and removes the files. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = validParams(event, paramsSchema)
  const job = await visibleExportJob(person, id)
  if (job.requestedBy !== person.id && !hasRole(person, 'admin'))
    throw createError({ statusCode: 403, message: 'Only the person who started an export, or an admin, can cancel it.' })
  const database = useDatabase()
  const cancelled = await database.transaction(async (tx) => {
    const [row] = await tx.update(exportJobs).set({ status: 'cancelled', finishedAt: new Date() })
      .where(and(eq(exportJobs.id, id), inArray(exportJobs.status, ['queued', 'running']))).returning()
    if (row) await recordAudit(database, { action: 'export_cancelled', actorId: person.id, actorEmail: person.email, subjectType: 'export', subjectId: id, details: { done: row.done, total: row.total } }, tx)
    return row
  })
  if (!cancelled) throw createError({ statusCode: 409, message: `This export is already ${job.status}; only a queued or running export can be cancelled.` })
  return { job: exportJobView(cancelled) }
})
