import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'

const migrationsFolder = fileURLToPath(new URL('./migrations', import.meta.url))

/**
 * Apply the committed migrations. Several app servers may start at once, so the work runs
 * under a session-level advisory lock; drizzle skips migrations that were already applied.
 */
export async function applyMigrations(databaseUrl: string): Promise<void> {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  try {
    await client.query('SELECT pg_advisory_lock(874201)')
    await migrate(drizzle(client), { migrationsFolder })
  }
  finally {
    await client.query('SELECT pg_advisory_unlock(874201)').catch(() => {})
    await client.end()
  }
}
