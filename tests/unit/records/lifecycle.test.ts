import { describe, expect, it } from 'vitest'
import { entryStateOf, mayDo, openActions, versionStatusOf } from '#shared/records/lifecycle'
import type { EntryState, LifecycleAction, LifecycleEntry } from '#shared/records/lifecycle'

// The entry lifecycle (DESIGN.md "The signed record" §8 and the permissions table): common
// practice of the product, no outside source.

const author = { id: 'author', roles: ['scientist'] }
const witness = { id: 'witness', roles: ['witness'] }
const officer = { id: 'officer', roles: ['compliance'] }
const admin = { id: 'admin', roles: ['admin'] }
const entry = (state: EntryState, extra: Partial<LifecycleEntry> = {}): LifecycleEntry =>
  ({ authorId: 'author', state, personIsMember: true, personAskedToWitness: false, ...extra })

describe('entryStateOf', () => {
  it('derives the state from the facts, a countersignature winning over a decline', () => {
    expect(entryStateOf({ frozen: false, countersigned: false, declined: false })).toBe('draft')
    // Without a frozen version nothing else counts (no signature can exist without it).
    expect(entryStateOf({ frozen: false, countersigned: true, declined: true })).toBe('draft')
    expect(entryStateOf({ frozen: true, countersigned: false, declined: false })).toBe('awaiting_witness')
    expect(entryStateOf({ frozen: true, countersigned: true, declined: false })).toBe('witnessed')
    expect(entryStateOf({ frozen: true, countersigned: false, declined: true })).toBe('declined')
    expect(entryStateOf({ frozen: true, countersigned: true, declined: true })).toBe('witnessed')
    expect(versionStatusOf(1, { version: 2, state: 'draft' })).toBe('superseded')
    expect(versionStatusOf(2, { version: 2, state: 'witnessed' })).toBe('witnessed')
  })
})

describe('mayDo', () => {
  const table: [LifecycleAction, typeof author, LifecycleEntry, true | 403 | 409][] = [
    ['edit', author, entry('draft'), true],
    ['edit', author, entry('awaiting_witness'), 409],
    ['edit', witness, entry('draft'), 403],
    ['edit', { id: 'other', roles: ['scientist'] }, entry('draft'), 403],
    ['sign', author, entry('draft'), true],
    ['sign', author, entry('witnessed'), 409],
    ['sign', admin, entry('draft'), 403],
    ['sign', { id: 'author', roles: ['admin'] }, entry('draft'), 403],
    ['requestWitness', author, entry('awaiting_witness'), true],
    ['requestWitness', author, entry('draft'), 409],
    ['requestWitness', author, entry('declined'), 409],
    ['countersign', witness, entry('awaiting_witness', { personAskedToWitness: true }), true],
    ['countersign', witness, entry('awaiting_witness'), 403],
    ['countersign', witness, entry('awaiting_witness', { personAskedToWitness: true, personIsMember: false }), 403],
    ['countersign', { id: 'author', roles: ['scientist', 'witness'] }, entry('awaiting_witness', { personAskedToWitness: true }), 403],
    ['countersign', witness, entry('witnessed', { personAskedToWitness: true }), 409],
    ['countersign', officer, entry('awaiting_witness', { personAskedToWitness: true }), 403],
    ['countersign', admin, entry('awaiting_witness', { personAskedToWitness: true }), 403],
    ['decline', witness, entry('awaiting_witness', { personAskedToWitness: true }), true],
    ['decline', witness, entry('declined', { personAskedToWitness: true }), 409],
    ['amend', author, entry('awaiting_witness'), true],
    ['amend', author, entry('witnessed'), true],
    ['amend', author, entry('declined'), true],
    ['amend', author, entry('draft'), 409],
    ['amend', officer, entry('witnessed'), 403],
  ]
  it.each(table)('%s by %o on %o → %s', (action, person, target, expected) => {
    const permission = mayDo(action, person, target)
    if (expected === true) expect(permission).toEqual({ allowed: true })
    else expect(permission).toMatchObject({ allowed: false, status: expected, reason: expect.stringMatching(/\w+/) })
  })

  it('opens no action to an administrator, whatever the entry', () => {
    for (const state of ['draft', 'awaiting_witness', 'witnessed', 'declined'] as const)
      expect(Object.values(openActions(admin, entry(state, { authorId: 'admin', personAskedToWitness: true }))).some(Boolean)).toBe(false)
  })
})
