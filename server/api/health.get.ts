import { sql } from 'drizzle-orm'

/** Readiness for load balancers and the start script: 200 when the database answers. */
export default defineEventHandler(async () => {
  await useDatabase().execute(sql`SELECT 1`)
  return { ok: true }
})
