import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'

const migrationsFolder = fileURLToPath(new URL('./migrations', import.meta.url))

/** The app's database role unless THERMOTOME_APP_DB_ROLE names another. */
export const DEFAULT_APP_ROLE = 'thermotome_app'

/**
 * Tables that hold signed or audit data. The app role may only read and add rows to them, so
 * even a compromised app server cannot rewrite history; their triggers refuse changes from the
 * owner too. (signing_keys stays updatable for retiring and confirming a key, which its guard
 * trigger allows and nothing else; it cannot be deleted.) A new frozen table goes here.
 */
export const FROZEN_TABLES = ['audit_events', 'audit_checkpoints', 'entry_versions', 'signatures'] as const
const KEPT_FOREVER = ['signing_keys'] as const

/**
 * Apply the committed migrations, as the database owner. Several app servers may start at
 * once, so the work runs under a session-level advisory lock; drizzle skips migrations that
 * were already applied. Then the app role (if it exists) gets its privileges afresh, so tables
 * added by later migrations are covered.
 */
export async function applyMigrations(databaseUrl: string, appRole = process.env.THERMOTOME_APP_DB_ROLE ?? DEFAULT_APP_ROLE): Promise<void> {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  try {
    await client.query('SELECT pg_advisory_lock(874201)')
    await migrate(drizzle(client), { migrationsFolder })
    await grantAppRole(client, appRole)
  }
  finally {
    await client.query('SELECT pg_advisory_unlock(874201)').catch(() => {})
    await client.end()
  }
}

/**
 * The app role's privileges: connect, read and write the working tables, use their sequences;
 * on frozen tables SELECT and INSERT only; no DDL (it owns nothing, so it cannot ALTER or
 * DISABLE TRIGGER), no TRUNCATE, and, not being a superuser, no session_replication_role.
 * Skipped (with a note) when the role does not exist, e.g. a deployment that has not made it.
 */
export async function grantAppRole(client: pg.ClientBase, appRole: string): Promise<boolean> {
  if (!/^[a-z_][a-z0-9_]*$/.test(appRole))
    throw new Error(`THERMOTOME_APP_DB_ROLE must be a plain lower-case role name, got ${JSON.stringify(appRole)}`)
  const { rows: [role] } = await client.query<{ rolsuper: boolean }>('SELECT rolsuper FROM pg_roles WHERE rolname = $1', [appRole])
  if (!role) {
    console.warn(`[migrate] the app role ${appRole} does not exist: no privileges granted (see README, "Database roles").`)
    return false
  }
  if (role.rolsuper)
    console.warn(`[migrate] the app role ${appRole} is a superuser: it can bypass every trigger. Make it NOSUPERUSER.`)
  const { rows } = await client.query<{ database: string }>('SELECT current_database() AS database')
  const database = rows[0]!.database
  const quote = (name: string) => `"${name.replace(/"/g, '""')}"`
  await client.query(`GRANT CONNECT, TEMPORARY ON DATABASE ${quote(database)} TO ${appRole}`)
  await client.query(`GRANT USAGE ON SCHEMA public TO ${appRole}`)
  await client.query(`REVOKE CREATE ON SCHEMA public FROM ${appRole}`)
  await client.query(`GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO ${appRole}`)
  await client.query(`REVOKE TRUNCATE, REFERENCES, TRIGGER ON ALL TABLES IN SCHEMA public FROM ${appRole}`)
  await client.query(`REVOKE UPDATE, DELETE ON ${FROZEN_TABLES.join(', ')} FROM ${appRole}`)
  await client.query(`REVOKE DELETE ON ${KEPT_FOREVER.join(', ')} FROM ${appRole}`)
  await client.query(`GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO ${appRole}`)
  return true
}
