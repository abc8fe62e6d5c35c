import { describe, expect, it } from 'vitest'
import { isDatabaseUnavailable } from '../../../server/utils/databaseErrors'

describe('recognising an unreachable database', () => {
  it('knows refused connections and PostgreSQL shutdown codes (PostgreSQL manual, Appendix A: class 57 and 08)', () => {
    expect(isDatabaseUnavailable(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:54329'), { code: 'ECONNREFUSED' }))).toBe(true)
    expect(isDatabaseUnavailable(Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }))).toBe(true)
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true)
  })

  it('looks through wrappers (h3 errors carry the pg error as cause; AggregateError lists attempts)', () => {
    const refused = Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' })
    expect(isDatabaseUnavailable(new Error('wrapped', { cause: refused }))).toBe(true)
    expect(isDatabaseUnavailable(new AggregateError([refused], 'all attempts failed'))).toBe(true)
  })

  it('does not mistake ordinary query errors for an outage', () => {
    expect(isDatabaseUnavailable(Object.assign(new Error('duplicate key value'), { code: '23505' }))).toBe(false)
    expect(isDatabaseUnavailable(new TypeError('x is undefined'))).toBe(false)
    expect(isDatabaseUnavailable(undefined)).toBe(false)
  })
})
