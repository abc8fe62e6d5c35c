import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { as } from '../support/http'

let database: pg.Client
beforeAll(async () => {
  database = new pg.Client({ connectionString: inject('databaseURL') })
  await database.connect()
})
afterAll(async () => { await database.end() })

describe('the audit trail is append-only', () => {
  it('refuses UPDATE through SQL', async () => {
    await expect(database.query(`UPDATE audit_events SET action = 'edited' WHERE sequence = (SELECT min(sequence) FROM audit_events)`))
      .rejects.toThrow(/append-only: UPDATE refused/)
  })

  it('refuses DELETE through SQL', async () => {
    await expect(database.query('DELETE FROM audit_events')).rejects.toThrow(/append-only: DELETE refused/)
  })

  it('refuses TRUNCATE through SQL', async () => {
    await expect(database.query('TRUNCATE audit_events')).rejects.toThrow(/append-only: TRUNCATE refused/)
  })
})

describe('the audit chain', () => {
  it('verifies end to end after real activity', async () => {
    const officer = await as('felix')
    const reply = await officer.get('/api/audit/verify')
    expect(reply.status).toBe(200)
    expect(reply.body.ok).toBe(true)
    expect(reply.body.checked).toBeGreaterThan(1)
    const { rows } = await database.query('SELECT count(*)::int AS n FROM audit_events')
    expect(reply.body.checked).toBe(rows[0].n)
  })

  it('links each event to the one before it', async () => {
    const { rows } = await database.query('SELECT previous_hash, hash FROM audit_events ORDER BY sequence')
    expect(rows[0].previous_hash).toBe('0'.repeat(64))
    for (let i = 1; i < rows.length; i++)
      expect(rows[i].previous_hash).toBe(rows[i - 1].hash)
  })

  it('detects a row changed behind the trigger\'s back, naming the event', async () => {
    const officer = await as('felix')
    const { rows: [target] } = await database.query(`SELECT sequence, details FROM audit_events WHERE action = 'sign_in' ORDER BY sequence LIMIT 1`)
    await database.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update')
    try {
      await database.query(`UPDATE audit_events SET details = '{"forged": true}' WHERE sequence = $1`, [target.sequence])
      const broken = await officer.get('/api/audit/verify')
      expect(broken.body.ok).toBe(false)
      expect(broken.body.problem.sequence).toBe(Number(target.sequence))
      expect(broken.body.problem.message).toMatch(/changed after it was written/)
    }
    finally {
      await database.query('UPDATE audit_events SET details = $2 WHERE sequence = $1', [target.sequence, target.details])
      await database.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update')
    }
    expect((await officer.get('/api/audit/verify')).body.ok).toBe(true)
  })

  it('detects a removed event by the broken link', async () => {
    const officer = await as('felix')
    const { rows: [target] } = await database.query(`SELECT * FROM audit_events ORDER BY sequence DESC OFFSET 2 LIMIT 1`)
    await database.query('ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update')
    try {
      await database.query('DELETE FROM audit_events WHERE sequence = $1', [target.sequence])
      const broken = await officer.get('/api/audit/verify')
      expect(broken.body.ok).toBe(false)
      expect(broken.body.problem.message).toMatch(/does not link/)
    }
    finally {
      await database.query(
        `INSERT INTO audit_events (sequence, occurred_at, actor_id, actor_email, action, subject_type, subject_id, details, previous_hash, hash)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)`,
        [target.sequence, target.occurred_at, target.actor_id, target.actor_email, target.action, target.subject_type, target.subject_id, target.details, target.previous_hash, target.hash],
      )
      await database.query('ALTER TABLE audit_events ENABLE TRIGGER audit_events_no_update')
    }
    expect((await officer.get('/api/audit/verify')).body.ok).toBe(true)
  })

  it('lists events for records officers with filters and paging', async () => {
    const officer = await as('felix')
    const reply = await officer.get('/api/audit?action=sign_in&pageSize=5')
    expect(reply.status).toBe(200)
    expect(reply.body.events.length).toBeLessThanOrEqual(5)
    expect(reply.body.events.every((e: { action: string }) => e.action === 'sign_in')).toBe(true)
    const bad = await officer.get('/api/audit?from=yesterday')
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^from:/)
  })
})
