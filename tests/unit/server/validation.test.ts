import { describe, expect, it } from 'vitest'
import { formatIssuePath } from '../../../server/utils/validation'
import { createPersonSchema, passwordResetSchema, signInSchema } from '../../../shared/schemas/people'
import { entryListQuerySchema } from '../../../shared/schemas/entries'

describe('field paths in error messages', () => {
  it('formats nested paths the way people read them', () => {
    expect(formatIssuePath(['levels', 2, 'degeneracy'])).toBe('levels[2].degeneracy')
    expect(formatIssuePath(['temperature'])).toBe('temperature')
    expect(formatIssuePath([])).toBe('')
  })
})

describe('shared input schemas', () => {
  it('enforces the 12-character password rule and names the field', () => {
    // The person sets it with their mailed link; administrators never give one.
    const result = passwordResetSchema.safeParse({ token: 'a'.repeat(43), password: 'short' })
    expect(result.success).toBe(false)
    expect(result.error!.issues[0]!.path).toEqual(['password'])
    expect(result.error!.issues[0]!.message).toMatch(/12 characters/)
  })

  it('normalises e-mail case and removes duplicate roles', () => {
    const parsed = createPersonSchema.parse({ email: ' Ada@Lab.Example ', name: 'Ada', roles: ['witness', 'scientist', 'witness'] })
    expect(parsed.email).toBe('ada@lab.example')
    expect(parsed.roles).toEqual(['scientist', 'witness'])
  })

  it('rejects an unknown role by name', () => {
    const result = createPersonSchema.safeParse({ email: 'a@lab.example', name: 'A', roles: ['superuser'] })
    expect(result.success).toBe(false)
    expect(result.error!.issues[0]!.path).toEqual(['roles', 0])
  })

  it('coerces list paging from the query string and bounds the page size', () => {
    expect(entryListQuerySchema.parse({ page: '3', pageSize: '10' })).toMatchObject({ page: 3, pageSize: 10, sort: 'updatedAt', direction: 'desc' })
    expect(entryListQuerySchema.safeParse({ pageSize: '1000' }).success).toBe(false)
    expect(signInSchema.safeParse({ email: 'not an address', password: 'x' }).success).toBe(false)
  })
})
