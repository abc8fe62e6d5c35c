import { describe, expect, it } from 'vitest'
import { evaluate, EngineInputError } from '../../../shared/thermo'
import { issuesOutsideFields } from '../../../shared/editor/blockForms'
import {
  LEVEL_ROWS_EDITABLE_MAX, LEVEL_TABLE_IMPORT_MAX, LEVEL_TABLE_JSON_BYTES_MAX, levelTableJsonBytes, levelTableSummary, levelTableToRows,
} from '../../../shared/editor/levelTable'
import { LEVEL_TABLE_ROWS_SHOWN } from '../../../shared/present'

/** The engine's issues for an input, by path, as the block collects them. */
function issuesOf(input: unknown): Record<string, string> {
  try {
    evaluate({ kind: 'levels', input })
    return {}
  }
  catch (error) {
    if (!(error instanceof EngineInputError)) throw error
    const found: Record<string, string> = {}
    for (const issue of error.issues) found[issue.path] ??= issue.message
    return found
  }
}

describe('levelTableSummary', () => {
  it('counts the levels and finds the lowest and highest energy, whatever their order', () => {
    const summary = levelTableSummary({ energyUnit: 'cm^-1', energies: [120, 0, 3500.25, -12.5, 800], degeneracies: [3, 1, 5, 1, 2] })
    expect(summary).toEqual({ count: 5, energyUnit: 'cm^-1', lowest: -12.5, highest: 3500.25, hasDegeneracies: true, hasLabels: false })
  })

  it('reads typed arrays, says whether labels are given, and skips entries that are not numbers', () => {
    expect(levelTableSummary({ energyUnit: 'eV', energies: Float64Array.of(0.5, 0.25), labels: ['a', 'b'] }))
      .toEqual({ count: 2, energyUnit: 'eV', lowest: 0.25, highest: 0.5, hasDegeneracies: false, hasLabels: true })
    // The engine names the bad entry; the summary still counts it.
    expect(levelTableSummary({ energyUnit: 'K', energies: [10, 'abc', null, 30] })).toMatchObject({ count: 4, lowest: 10, highest: 30 })
    expect(levelTableSummary({ energyUnit: 'K', energies: ['abc'] })).toMatchObject({ count: 1, lowest: null, highest: null })
  })

  it('gives null for anything that is not a table with a list of energies', () => {
    for (const value of [undefined, null, 'table', [], { energyUnit: 'cm^-1' }, { energies: 'many' }])
      expect(levelTableSummary(value), JSON.stringify(value)).toBeNull()
  })

  it('reads a table of the largest import size, highest energy first', () => {
    const energies = Array.from({ length: LEVEL_TABLE_IMPORT_MAX }, (_, index) => (LEVEL_TABLE_IMPORT_MAX - index) * 2.5)
    expect(levelTableSummary({ energyUnit: 'cm^-1', energies })).toMatchObject({ count: 20_000, lowest: 2.5, highest: 50_000 })
  })
})

describe('levelTableToRows', () => {
  it('writes each energy with the unit, keeps degeneracies and leaves out empty labels', () => {
    expect(levelTableToRows({ energyUnit: 'cm^-1', energies: [0, 2143.3, 1e-7], degeneracies: [1, 3, 5], labels: ['ground', '', 'far'] })).toEqual([
      { label: 'ground', energy: '0 cm^-1', degeneracy: 1 },
      { energy: '2143.3 cm^-1', degeneracy: 3 },
      { label: 'far', energy: '1e-7 cm^-1', degeneracy: 5 },
    ])
    expect(levelTableToRows({ energyUnit: 'eV', energies: [0, 0.1] })).toEqual([{ energy: '0 eV' }, { energy: '0.1 eV' }])
    expect(levelTableToRows(null)).toEqual([])
  })

  it('gives rows the engine reads to the same populations as the table (levels kind)', () => {
    const levelTable = { energyUnit: 'kJ/mol', energies: [0, 1.25, 2.5, 3.75e0, 12], degeneracies: [1, 3, 5, 7, 9], labels: ['a', 'b', 'c', 'd', 'e'] }
    const table = evaluate({ kind: 'levels', input: { levelTable, temperature: '300 K', amount: '1 mol' } }).result
    const rows = evaluate({ kind: 'levels', input: { levels: levelTableToRows(levelTable), temperature: '300 K', amount: '1 mol' } }).result
    rows.levels.forEach((level: { fraction: number }, index: number) => expect(table.levelTable.fractions[index]).toBeCloseTo(level.fraction, 14))
    expect(table.molarHeatCapacity).toBeCloseTo(rows.molarHeatCapacity, 10)
    expect(table.mostPopulated).toEqual(rows.mostPopulated)
  })
})

describe('level-table sizes', () => {
  it('edits as rows no more levels than a block lists in its results', () => {
    expect(LEVEL_ROWS_EDITABLE_MAX).toBeLessThanOrEqual(LEVEL_TABLE_ROWS_SHOWN)
  })

  it('keeps the largest import of typical levels well inside the 1 MB body limit (THERMOTOME_BODY_LIMIT default)', () => {
    // Invented ladder: energies with four decimals in cm^-1, g = 2J+1, labels such as "v=3 J=41".
    const energies: number[] = []
    const degeneracies: number[] = []
    const labels: string[] = []
    for (let index = 0; energies.length < LEVEL_TABLE_IMPORT_MAX; index++) {
      const v = Math.floor(index / 400)
      const J = index % 400
      energies.push(Number((2143.3 * v + 1.9313 * J * (J + 1) + 0.1234 * v * J).toFixed(4)))
      degeneracies.push(2 * J + 1)
      labels.push(`v=${v} J=${J}`)
    }
    const bytes = levelTableJsonBytes({ energyUnit: 'cm^-1', energies, degeneracies, labels })
    expect(bytes / LEVEL_TABLE_IMPORT_MAX).toBeGreaterThan(20)
    expect(bytes / LEVEL_TABLE_IMPORT_MAX).toBeLessThan(35)
    expect(bytes).toBeLessThan(LEVEL_TABLE_JSON_BYTES_MAX)
    expect(LEVEL_TABLE_JSON_BYTES_MAX).toBeLessThan(1024 * 1024)
  })

  it('counts label bytes as UTF-8, as the request body does', () => {
    expect(levelTableJsonBytes({ labels: ['Σ'] })).toBe(JSON.stringify({ labels: ['Σ'] }).length + 1)
  })
})

describe('issuesOutsideFields', () => {
  it('lists a level table\'s issues under the block (levelTable.energies[12]), not beside the row table', () => {
    const energies = Array.from({ length: 20 }, (_, index) => index * 10) as unknown[]
    energies[12] = 'abc'
    const errors = issuesOf({ levelTable: { energyUnit: 'cm^-1', energies }, temperature: '300 K' })
    expect(Object.keys(errors)).toEqual(['levelTable.energies[12]'])
    expect(issuesOutsideFields('levels', errors)).toEqual([['levelTable.energies[12]', errors['levelTable.energies[12]']]])
  })

  it('leaves issues a field shows to that field: a row cell, the temperature', () => {
    const errors = issuesOf({ levels: [{ energy: '0 cm^-1' }, { energy: '12' }], temperature: '300' })
    expect(Object.keys(errors).sort()).toEqual(['levels[1].energy', 'temperature'])
    expect(issuesOutsideFields('levels', errors)).toEqual([])
  })

  it('lists the issue of an input with both forms, and of one whose table lists do not match', () => {
    const both = issuesOf({ levels: [{ energy: '0 cm^-1' }], levelTable: { energyUnit: 'cm^-1', energies: [0] }, temperature: '300 K' })
    expect(issuesOutsideFields('levels', both).map(([path]) => path)).toEqual(['levelTable'])
    const uneven = issuesOf({ levelTable: { energyUnit: 'cm^-1', energies: [0, 1], degeneracies: [1] }, temperature: '300 K' })
    expect(issuesOutsideFields('levels', uneven).map(([path]) => path)).toEqual(['levelTable.degeneracies'])
  })
})
