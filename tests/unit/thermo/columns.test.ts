// Result columns: typed arrays in a result that write themselves as plain JSON arrays, so a
// level table of any size keeps the same JSON (and so the same signed record) as plain lists.
import { describe, expect, it } from 'vitest'
import { FlagColumn, NumberColumn, evaluate } from '../../../shared/thermo/index'
import { messageNumber } from '../../../shared/thermo/units'

describe('result columns', () => {
  it('write numbers as a JSON array, with NaN and ±Infinity as null like the rest of a result', () => {
    const column = NumberColumn.from([0.25, -3, Number.NaN, Number.POSITIVE_INFINITY, 1e-320]) as NumberColumn
    expect(JSON.stringify({ column })).toBe('{"column":[0.25,-3,null,null,1e-320]}')
    expect(column.allFinite()).toBe(false)
    expect((NumberColumn.from([1, 2]) as NumberColumn).allFinite()).toBe(true)
  })

  it('write flags as JSON booleans', () => {
    expect(JSON.stringify(FlagColumn.from([1, 0, 1]))).toBe('[true,false,true]')
  })
})

describe('levels given as a level table', () => {
  const input = { levelTable: { energyUnit: 'cm^-1', energies: [0, 150, 400, 3000], degeneracies: [1, 3, 5, 7] }, temperature: '300 K', amount: 500 }

  it('gives columns whose JSON holds the per-level numbers of the same levels typed as rows', () => {
    const table = JSON.parse(JSON.stringify(evaluate({ kind: 'levels', input }).result))
    const rows = evaluate({
      kind: 'levels',
      input: { levels: input.levelTable.energies.map((energy, index) => ({ energy: `${energy} cm^-1`, degeneracy: input.levelTable.degeneracies[index] })), temperature: '300 K', amount: 500 },
    }).result
    // Rows are converted to joules first and the table is scaled inside the kernel, so the last
    // bit may differ; everything else is the same statistics.
    rows.levels.forEach((level: { fraction: number; log10Fraction: number; count: number; belowOneParticle: boolean }, index: number) => {
      expect(typeof table.levelTable.fractions[index]).toBe('number')
      expect(table.levelTable.fractions[index]).toBeCloseTo(level.fraction, 14)
      expect(table.levelTable.log10Fractions[index]).toBeCloseTo(level.log10Fraction, 12)
      expect(table.levelTable.counts[index]).toBeCloseTo(level.count, 10)
      expect(table.levelTable.belowOneParticle[index]).toBe(level.belowOneParticle)
    })
    expect(Array.isArray(table.levelTable.fractions)).toBe(true)
    expect(table.levelTable.energies).toEqual([0, 150, 400, 3000])
    expect(table.levelTable.degeneracies).toEqual([1, 3, 5, 7])
    expect(table.levelTable.belowOneParticle).toContain(true)
  })

  it('accepts typed arrays as input and echoes them as JSON arrays', () => {
    const typed = evaluate({ kind: 'levels', input: { ...input, levelTable: { ...input.levelTable, energies: Float64Array.from(input.levelTable.energies), degeneracies: Float64Array.from(input.levelTable.degeneracies) } } })
    const plain = evaluate({ kind: 'levels', input })
    expect(JSON.stringify(typed.result)).toBe(JSON.stringify(plain.result))
  })

  it('writes populations that overflow a double as null with a warning, not as a broken number', () => {
    // β·E overflows for 10^308 eV: the level's numbers are not representable.
    const evaluation = evaluate({ kind: 'levels', input: { levelTable: { energyUnit: 'eV', energies: [0, 1e308] }, temperature: '300 K' } })
    const json = JSON.parse(JSON.stringify(evaluation.result))
    expect(json.levelTable.fractions).toEqual([1, 0])
    expect(json.levelTable.log10Fractions).toEqual([0, null])
    expect(evaluation.warnings.join(' ')).toMatch(/outside the range of a double/)
  })
})

describe('numbers in warnings', () => {
  it('write powers of ten out rather than in e-notation', () => {
    // N_A = 6.022 140 76 × 10²³ mol⁻¹ (SI 2019, exact), as a '1 mol' amount reads in a warning.
    expect(messageNumber(6.02214076e23, 4)).toBe('6.022×10²³')
    expect(messageNumber(1.5e-7, 2)).toBe('1.5×10⁻⁷')
    expect(messageNumber(0.25, 3)).toBe('0.250')
    const evaluation = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 eV' }, { energy: '5 eV' }], temperature: '300 K', amount: '1 mol' } })
    expect(evaluation.warnings.join(' ')).toContain('out of 6.022×10²³')
  })
})
