import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { auditHashPayload, auditRowHash, GENESIS_HASH } from '../../../server/database/audit-chain'

const row = {
  occurredAt: new Date('2026-11-02T09:30:00.000Z'),
  actorId: null,
  actorEmail: 'someone@lab.example',
  action: 'sign_in',
  subjectType: 'person',
  subjectId: 'p1',
  details: { b: 2, a: 1 },
  previousHash: GENESIS_HASH,
}

describe('audit chain hashing', () => {
  it('hashes the RFC 8785 canonical form of the row (keys sorted, no spaces)', () => {
    // RFC 8785 §3.2.3: object members sorted by key, no insignificant white space.
    expect(auditHashPayload(row)).toBe('{"action":"sign_in","actorEmail":"someone@lab.example","actorId":null,"details":{"a":1,"b":2},"occurredAt":"2026-11-02T09:30:00.000Z","previousHash":"' + GENESIS_HASH + '","subjectId":"p1","subjectType":"person"}')
    expect(auditRowHash(row)).toBe(createHash('sha256').update(auditHashPayload(row)).digest('hex'))
  })

  it('changes when any covered field or the link to the previous event changes', () => {
    const base = auditRowHash(row)
    expect(auditRowHash({ ...row, action: 'sign_out' })).not.toBe(base)
    expect(auditRowHash({ ...row, details: { a: 1, b: 3 } })).not.toBe(base)
    expect(auditRowHash({ ...row, previousHash: 'f'.repeat(64) })).not.toBe(base)
    expect(auditRowHash({ ...row, details: { a: 1, b: 2 } })).toBe(base)
  })
})
