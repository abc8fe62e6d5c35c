// Audit details are read by people in words (entry history, audit page, record PDF): no raw
// field names such as `recordHash:` and no ids that only machines follow.
import { describe, expect, it } from 'vitest'
import { auditDetailsWords } from '../../../shared/audit/details'

const HASH = 'a'.repeat(64)

describe('audit details in words', () => {
  it('says a signing in words, leaving out machine ids', () => {
    const text = auditDetailsWords('entry_signed', { version: 2, title: 'CO ladder', recordHash: HASH, signatureId: 'x1', statementHash: 'b'.repeat(64), keyFingerprint: 'SHA256:ab' })
    expect(text).toBe(`“CO ladder”; version 2; record hash ${HASH}; statement hash ${'b'.repeat(64)}; key fingerprint SHA256:ab`)
    expect(text).not.toMatch(/recordHash|signatureId|x1/)
  })

  it('says one editing session as its saves, its times and its content hashes', () => {
    const text = auditDetailsWords('entry_edited', {
      version: 1, saves: 200, firstSavedAt: '2026-03-02T09:00:00.000Z', lastSavedAt: '2026-03-02T09:41:10.000Z',
      firstContentHash: 'c'.repeat(64), lastContentHash: 'd'.repeat(64), titleChanged: true, closedBy: 'idle', fromLockVersion: 3, toLockVersion: 202,
    })
    expect(text).toBe(`200 saves; from 2026-03-02 09:00:00 UTC to 2026-03-02 09:41:10 UTC; version 1; title changed; content hash after the first save ${'c'.repeat(64)}; after the last ${'d'.repeat(64)}`)
    expect(auditDetailsWords('entry_edited', { saves: 1, firstSavedAt: '2026-03-02T09:00:00.000Z', lastSavedAt: '2026-03-02T09:00:00.000Z', firstContentHash: HASH, lastContentHash: HASH }))
      .toBe(`1 save; at 2026-03-02 09:00:00 UTC; content hash after the first save ${HASH}`)
  })

  it('spaces out fields it has no words for, states booleans, lists and nested filters, and leaves out what the reader already sees', () => {
    expect(auditDetailsWords('records_searched', { filters: { q: 'CO', state: 'witnessed' }, page: 1, matched: 3 })).toBe('records found 3; page 1; filters q CO, state witnessed')
    expect(auditDetailsWords('future_thing', { someNewField: true, otherList: ['a', 'b'] })).toBe('other list a, b; some new field yes')
    expect(auditDetailsWords('entry_signed', { title: 'CO ladder', version: 1 }, ['title'])).toBe('version 1')
    expect(auditDetailsWords('x', null)).toBe('')
  })
})
