import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  RECORD_TOLERANCE, buildEntryRecord, compareOfferedRecord, compareResults, numbersAgree, recheckRecord, recheckSummary, warningsAgree,
} from '#shared/records'
import type { RecordDocument } from '#shared/records'
import { evaluate, listKinds } from '#shared/thermo'
import { KIND_INPUTS, documentOf, sampleInputs } from '../../support/generatedInputs'

// The record tolerance (shared/records/recheck.ts). Browser and server engines differ in the
// last binary digits (a fraction 0.398381630133162 on one, 0.39838163013316197 on the other),
// so a record is compared within a relative 1e-9, never bit for bit. The values perturbed here
// are the engine's own results; nothing is a reference value.

/** Every number in a JSON value moved by `ulps` units in the last place, as another engine might. */
function nudged(value: unknown, ulps: number): unknown {
  if (typeof value === 'number') return value === 0 ? value : value * (1 + ulps * Number.EPSILON)
  if (Array.isArray(value)) return value.map(item => nudged(item, ulps))
  if (value !== null && typeof value === 'object') return Object.fromEntries(Object.entries(value).map(([key, item]) => [key, nudged(item, ulps)]))
  return value
}

function recordOf(kind: string, inputs: unknown[]): RecordDocument {
  return buildEntryRecord({
    entry: { id: 'generated', title: `Generated ${kind}`, content: documentOf(inputs.map((input, index) => ({ kind, input, title: `${kind} ${index + 1}` }))), version: 1, supersedesVersion: null },
    notebook: { id: 'notebook', name: 'Generated' },
    attachments: [],
  })
}

describe('the record tolerance', () => {
  it('has a generator for every kind in the registry', () => {
    expect(Object.keys(KIND_INPUTS).sort()).toEqual(listKinds().map(kind => kind.kind).sort())
  })

  for (const kind of Object.keys(KIND_INPUTS)) {
    it(`accepts 50 generated ${kind} blocks recomputed with last-digit differences, and names a real difference`, () => {
      const inputs = sampleInputs(kind, 50, 2026)
      for (const input of inputs) expect(() => evaluate({ kind, input })).not.toThrow()
      const record = recordOf(kind, inputs)
      expect(recheckRecord(record)).toMatchObject({ agrees: true, blockCount: 50 })

      // Another engine's last bits: a few ulps on every number still agrees.
      const otherEngine = structuredClone(record)
      otherEngine.calculations = record.calculations.map(calculation => ({ ...calculation, result: nudged(calculation.result, 4) as typeof calculation.result }))
      expect(recheckRecord(otherEngine).blocks).toEqual([])

      // A real change (one number by a relative 1e-6) is refused, naming block, quantity, values and difference.
      const changed = structuredClone(record)
      const target = changed.calculations[7]!
      const path = firstNonZeroNumberPath(target.result)!
      setAt(target.result, path, (getAt(record.calculations[7]!.result, path) as number) * (1 + 1e-6))
      const comparison = recheckRecord(changed)
      expect(comparison.agrees).toBe(false)
      expect(comparison.blocks).toHaveLength(1)
      const [block] = comparison.blocks
      expect(block).toMatchObject({ title: `${kind} 8`, position: 8, what: 'value' })
      expect(block!.quantities[0]!.path).toEqual(path)
      expect(block!.quantities[0]!.relativeDifference).toBeCloseTo(1e-6, 9)
      expect(block!.message).toContain(`“${kind} 8”`)
      expect(block!.message).toMatch(/recorded .+, recomputed here .+ \(relative difference 1\.00e-6\)/)
    })
  }

  it('holds for any mix of kinds and perturbations below the tolerance (fast-check)', () => {
    const kinds = Object.keys(KIND_INPUTS)
    fc.assert(fc.property(
      fc.array(fc.constantFrom(...kinds).chain(kind => KIND_INPUTS[kind]!.map(input => ({ kind, input }))), { minLength: 1, maxLength: 6 }),
      fc.integer({ min: 1, max: 1000 }),
      (blocks, ulps) => {
        const record = buildEntryRecord({
          entry: { id: 'mix', title: 'Mixed', content: documentOf(blocks.map((block, index) => ({ ...block, title: `block ${index + 1}` }))), version: 1, supersedesVersion: null },
          notebook: { id: 'n', name: 'n' },
          attachments: [],
        })
        const other = structuredClone(record)
        other.calculations = record.calculations.map(calculation => ({ ...calculation, result: nudged(calculation.result, ulps) as typeof calculation.result }))
        // The page's view of the same entry, with another engine's last bits, signs the server's record.
        const comparison = compareOfferedRecord(record, other)
        expect(comparison.agrees).toBe(true)
        expect(recheckSummary(comparison, 'author').agrees).toBe(true)
      },
    ), { numRuns: 40, seed: 13 })
  })

  it('compares values near zero on the scale of their series (the absolute floor)', () => {
    const recorded = { levels: [{ energyJ: 0 }, { energyJ: 4e-20 }], offset: 0 }
    // 1e-33 J beside 4e-20 J is far below 1e-12 of the series: agrees.
    expect(compareResults(recorded, { levels: [{ energyJ: 1e-33 }, { energyJ: 4e-20 }], offset: 0 })).toEqual([])
    // 1e-30 J is above it: refused.
    expect(compareResults(recorded, { levels: [{ energyJ: 1e-30 }, { energyJ: 4e-20 }], offset: 0 })).toHaveLength(1)
    // A lone scalar has no series to lean on: it is compared relatively.
    expect(compareResults(recorded, { ...recorded, offset: 1e-300 })).toHaveLength(1)
    expect(numbersAgree(1, 1 + 0.9 * RECORD_TOLERANCE.relative)).toBe(true)
    expect(numbersAgree(1, 1 + 1.1 * RECORD_TOLERANCE.relative)).toBe(false)
  })

  it('refuses any difference in text, kind or shape', () => {
    expect(compareResults({ count: '15' }, { count: '16' })).toMatchObject([{ path: ['count'], recorded: '15', recomputed: '16', relativeDifference: null }])
    expect(compareResults({ list: [1, 2] }, { list: [1, 2, 3] })).toHaveLength(1)
    expect(compareResults({ value: null }, { value: 0 })).toHaveLength(1)
    expect(compareResults({ a: 1 }, { a: 1, b: 2 })).toMatchObject([{ path: ['b'], recorded: 'absent' }])
  })

  it('reads warnings as words with rounded numbers: one unit in the last printed digit is the same warning', () => {
    expect(warningsAgree(['population 1.234e-5 above level 40'], ['population 1.235e-5 above level 40'])).toBe(true)
    expect(warningsAgree(['population 1.234e-5 above level 40'], ['population 1.236e-5 above level 40'])).toBe(false)
    expect(warningsAgree(['truncated at 6,022 levels'], ['truncated at 6,023 levels'])).toBe(true)
    expect(warningsAgree(['truncated ladder'], ['high-temperature approximation used'])).toBe(false)
  })

  it('names every part outside the calculations that differs', () => {
    const record = recordOf('levels', sampleInputs('levels', 2, 1))
    const retitled = structuredClone(record)
    retitled.entry.title = 'Another title'
    retitled.attachments = [{ name: 'x.csv', mediaType: 'text/csv', size: 1, sha256: 'a'.repeat(64) }]
    const comparison = compareOfferedRecord(record, retitled)
    expect(comparison.parts).toEqual(['the title', 'the attached files'])
    const words = recheckSummary(comparison, 'author')
    expect(words.headline).toMatch(/^Not signed/)
    expect(words.lines).toContain('The title differs from the record the server offered.')
  })

  it('words one comparison for each role', () => {
    const record = recordOf('rotation', sampleInputs('rotation', 1, 3))
    const changed = structuredClone(record)
    ;(changed.calculations[0]!.result as { partitionFunction: number }).partitionFunction *= 1.01
    const comparison = recheckRecord(changed)
    const witness = recheckSummary(comparison, 'witness')
    const officer = recheckSummary(comparison, 'records officer')
    expect(witness.lines).toEqual(officer.lines)
    expect(witness.advice).toMatch(/Do not countersign/)
    expect(officer.advice).toMatch(/note this difference/)
  })
})

function firstNonZeroNumberPath(value: unknown, path: (string | number)[] = []): (string | number)[] | null {
  if (typeof value === 'number') return value !== 0 && Number.isFinite(value) ? path : null
  const entries: [string | number, unknown][] = Array.isArray(value) ? value.map((item, index) => [index, item]) : value && typeof value === 'object' ? Object.entries(value) : []
  for (const [key, item] of entries) {
    const found = firstNonZeroNumberPath(item, [...path, key])
    if (found) return found
  }
  return null
}
function getAt(value: unknown, path: (string | number)[]): unknown {
  return path.reduce<unknown>((current, key) => (current as Record<string | number, unknown>)[key], value)
}
function setAt(value: unknown, path: (string | number)[], next: unknown) {
  const parent = getAt(value, path.slice(0, -1)) as Record<string | number, unknown>
  parent[path.at(-1)!] = next
}
