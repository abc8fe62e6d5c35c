import pg from 'pg'
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import * as schema from '../database/schema'

export { schema }
export type Database = NodePgDatabase<typeof schema>

let database: Database | undefined
let pool: pg.Pool | undefined

/** The one connection pool of this server process, made on first use. */
export function useDatabase(): Database {
  if (!database) {
    const connectionString = process.env.DATABASE_URL
    if (!connectionString)
      throw createError({ statusCode: 503, message: 'The database is not configured: set DATABASE_URL.' })
    pool = new pg.Pool({ connectionString, max: Number(process.env.THERMOTOME_DB_POOL ?? 10) })
    // An idle client losing its server must not crash the process; the next query reconnects.
    pool.on('error', (error) => { console.error('[db] idle client error:', error.message) })
    database = drizzle(pool, { schema })
  }
  return database
}
