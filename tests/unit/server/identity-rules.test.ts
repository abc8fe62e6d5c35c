import { describe, expect, it } from 'vitest'
import { DrizzleQueryError } from 'drizzle-orm/errors'
import { redactQueryParameters } from '../../../server/utils/logRedaction'
import { signingKeyMaySign } from '../../../server/utils/signing'
import { createNotebookSchema } from '../../../shared/schemas/notebooks'
import { entryTitleSchema } from '../../../shared/schemas/entries'
import { hiddenCharacterIn } from '../../../shared/schemas/text'
import { createPersonSchema, updatePersonSchema } from '../../../shared/schemas/people'

describe('signingKeyMaySign: the one rule for a key making a new signature', () => {
  const made = new Date('2026-11-02T09:00:00Z')
  it('allows an active, confirmed key', () => {
    expect(signingKeyMaySign({ retiredAt: null, retiredReason: null, confirmedAt: made })).toEqual({ ok: true })
  })
  it('refuses a replacement that no records officer has confirmed yet', () => {
    const verdict = signingKeyMaySign({ retiredAt: null, retiredReason: null, confirmedAt: null })
    expect(verdict).toMatchObject({ ok: false, statusCode: 403 })
    expect(!verdict.ok && verdict.message).toMatch(/waits for a records officer/)
  })
  it('refuses a retired key, confirmed or not, naming when and why it was retired', () => {
    const verdict = signingKeyMaySign({ retiredAt: made, retiredReason: 'rotated', confirmedAt: made })
    expect(!verdict.ok && verdict.message).toMatch(/retired on 2026-11-02T09:00:00.000Z \(rotated\)/)
  })
})

describe('query parameters never reach a log', () => {
  it('withholds the bound values of a failed query from its message, stack and params, through the cause chain', () => {
    const hash = '$scrypt$n=16384,r=8,p=1$c2FsdHNhbHQ$aGFzaGhhc2hoYXNo'
    const failed = new DrizzleQueryError('update "people" set "password_hash" = $1 where "people"."id" = $2', [hash, '6f1c…'], new Error('connection reset'))
    const wrapper = new Error(failed.message, { cause: failed })
    expect(`${wrapper.stack}${failed.stack}`).toContain(hash)
    redactQueryParameters(wrapper)
    expect(JSON.stringify([wrapper.message, wrapper.stack, failed.message, failed.stack, failed.params])).not.toContain(hash)
    // The statement stays: it says what failed.
    expect(failed.message).toMatch(/^Failed query: update "people" set "password_hash"/)
    expect(failed.message).toMatch(/params: \(withheld\)/)
  })
  it('leaves an ordinary error alone', () => {
    const plain = new Error('disk full')
    redactQueryParameters(plain)
    expect(plain.message).toBe('disk full')
  })
})

describe('titles refuse invisible characters that change how they read', () => {
  // Unicode UAX #9 (bidirectional controls) and the zero-width characters; CVE-2021-42574.
  it('names the character by code point and name', () => {
    expect(hiddenCharacterIn('abc\u202Edef')).toBe('U+202E (right-to-left override)')
    expect(hiddenCharacterIn('a\u2067b')).toBe('U+2067 (right-to-left isolate)')
    expect(hiddenCharacterIn('zero\u200Bwidth')).toBe('U+200B (zero-width space)')
    expect(hiddenCharacterIn('\uFEFFbom')).toBe('U+FEFF (zero-width no-break space)')
    expect(hiddenCharacterIn('Population at 296 K — ν₂ band, naïve, 温度, שלום')).toBeNull()
  })
  it('refuses them in entry titles and notebook names with a message on the field', () => {
    const title = entryTitleSchema.safeParse('Cell B \u202Dreport')
    expect(title.success).toBe(false)
    expect(title.error!.issues[0]!.message).toMatch(/^contains U\+202D \(left-to-right override\)/)
    const notebook = createNotebookSchema.safeParse({ name: 'Bench\u200D notes' })
    expect(notebook.success).toBe(false)
    expect(notebook.error!.issues[0]!.path).toEqual(['name'])
  })
})

describe('administrators never set passwords', () => {
  it('refuses a password field in a new person or a change, by name', () => {
    const created = createPersonSchema.safeParse({ email: 'new@lab.example', name: 'New', roles: [], password: 'twelve chars ok' })
    expect(created.success).toBe(false)
    expect(created.error!.issues[0]!.path).toEqual(['password'])
    const changed = updatePersonSchema.safeParse({ password: 'twelve chars ok' })
    expect(changed.success).toBe(false)
    expect(createPersonSchema.safeParse({ email: 'new@lab.example', name: 'New', roles: [] }).success).toBe(true)
  })
})
