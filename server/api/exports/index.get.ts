import { desc, eq } from 'drizzle-orm'
import { exportJobs } from '../../database/schema'

/** The signed-in person's own bulk exports, newest first, and how many days finished files are kept. */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const jobs = await useDatabase().select().from(exportJobs).where(eq(exportJobs.requestedBy, person.id)).orderBy(desc(exportJobs.createdAt)).limit(20)
  return { jobs: jobs.map(exportJobView), retentionDays: exportRetentionDays() }
})
