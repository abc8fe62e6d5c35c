import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'

// Issue 14, part 3: the server connects as the app role (tests/support/global-setup.ts hands it
// the URL `postgres.sh url app` prints), which can read and add signed and audit rows but never
// change them, switch off the triggers that guard them, or step around those triggers.

let app: pg.Client
beforeAll(async () => {
  app = new pg.Client({ connectionString: inject('appDatabaseURL') })
  await app.connect()
})
afterAll(async () => { await app.end() })

/** PostgreSQL's SQLSTATE of the refusal (42501 insufficient_privilege; 42501 too for "must be owner"). */
async function refusal(sql: string): Promise<{ code?: string, message: string }> {
  try {
    await app.query(sql)
  }
  catch (error) {
    return { code: (error as { code?: string }).code, message: (error as Error).message }
  }
  throw new Error(`the app role was allowed: ${sql}`)
}

describe('the app database role', () => {
  it('is not a superuser and owns none of the tables', async () => {
    const { rows: [role] } = await app.query('SELECT current_user AS name, rolsuper, rolcreaterole, rolcreatedb, rolbypassrls FROM pg_roles WHERE rolname = current_user')
    expect(role).toMatchObject({ name: 'thermotome_app', rolsuper: false, rolcreaterole: false, rolcreatedb: false, rolbypassrls: false })
    const { rows } = await app.query(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tableowner = current_user`)
    expect(rows).toEqual([])
  })

  it('cannot SET session_replication_role = replica (which would skip every trigger)', async () => {
    const refused = await refusal('SET session_replication_role = replica')
    expect(refused.code).toBe('42501')
    expect(refused.message).toMatch(/permission denied/)
  })

  it('cannot disable a trigger, drop one, or alter a frozen table', async () => {
    for (const sql of [
      'ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update',
      'ALTER TABLE signatures DISABLE TRIGGER ALL',
      'DROP TRIGGER entry_versions_frozen ON entry_versions',
      'ALTER TABLE signing_keys DISABLE TRIGGER signing_keys_guard',
    ]) {
      const refused = await refusal(sql)
      expect(refused.code, sql).toBe('42501')
      expect(refused.message, sql).toMatch(/must be owner/)
    }
  })

  it('cannot UPDATE, DELETE or TRUNCATE signed and audit rows: refused by privilege before any trigger', async () => {
    for (const sql of [
      `UPDATE audit_events SET details = '{}' WHERE sequence = (SELECT max(sequence) FROM audit_events)`,
      'DELETE FROM audit_events WHERE sequence = (SELECT max(sequence) FROM audit_events)',
      'TRUNCATE audit_events',
      `UPDATE signatures SET signature = 'forged'`,
      'DELETE FROM signatures',
      `UPDATE entry_versions SET title = 'rewritten'`,
      'DELETE FROM entry_versions',
      'DELETE FROM signing_keys',
    ]) {
      const refused = await refusal(sql)
      expect(refused.code, sql).toBe('42501')
      expect(refused.message, sql).toMatch(/permission denied for table/)
    }
  })

  it('cannot reach the migrations bookkeeping or create tables', async () => {
    expect((await refusal('SELECT * FROM drizzle.__drizzle_migrations')).code).toBe('42501')
    expect((await refusal('CREATE TABLE public.smuggled (id int)')).code).toBe('42501')
  })

  it('still reads and adds rows as the app needs', async () => {
    const { rows: [count] } = await app.query('SELECT count(*)::int AS n FROM audit_events')
    expect(count.n).toBeGreaterThan(0)
    await app.query('BEGIN')
    await app.query(`INSERT INTO sign_in_throttle (key, failures, window_started_at) VALUES ('database-roles-test', 1, now())`)
    await app.query(`UPDATE sign_in_throttle SET failures = 2 WHERE key = 'database-roles-test'`)
    await app.query('ROLLBACK')
  })
})
