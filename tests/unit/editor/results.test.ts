import { describe, expect, it } from 'vitest'
import { evaluate, listKinds } from '../../../shared/thermo'
import { LEVEL_TABLE_ROWS_SHOWN, presentResult } from '../../../shared/editor/results'

/** Reads a number as formatNumber writes it ("2.5×10⁻⁵", "−3"). */
function screenNumber(text: string): number {
  const digits: Record<string, string> = { '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9', '⁻': '-' }
  const plain = text.replace(/−/g, '-').replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]/g, c => digits[c]!)
  const power = /^(-?[\d.]+)?×?10(-?\d+)$/.exec(plain)
  return power ? Number(power[1] ?? 1) * 10 ** Number(power[2]) : Number(plain)
}

describe('presentResult', () => {
  it('gives every kind headline values, and tables and charts where the kind has them', () => {
    for (const kind of listKinds()) {
      const { result } = evaluate({ kind: kind.kind, input: kind.exampleInput })
      const presented = presentResult(kind.kind, result)
      expect(presented.values.length, kind.kind).toBeGreaterThan(0)
      for (const table of presented.tables) {
        for (const row of table.rows) expect(row.length, `${kind.kind} ${table.caption}`).toBe(table.headers.length)
      }
      if (!['thermochemistry', 'solveTemperature'].includes(kind.kind)) {
        expect(presented.chart?.svg, kind.kind).toMatch(/^<svg/)
        expect(presented.chart?.alt.length, kind.kind).toBeGreaterThan(10)
      }
    }
  })

  it('shows level fractions to six significant digits of the engine value', () => {
    const input = { levels: [{ energy: '0 cm^-1' }, { energy: '120 cm^-1', degeneracy: 3 }, { energy: '350 cm^-1', degeneracy: 5 }], temperature: '450 K' }
    const { result } = evaluate({ kind: 'levels', input })
    const table = presentResult('levels', result).tables[0]!
    table.rows.forEach((row, index) => {
      const engine = result.levels[index].fraction
      expect(Math.abs(screenNumber(row[3]!) - engine)).toBeLessThanOrEqual(5e-6 * engine)
    })
  })

  it('switches population charts between linear and logarithmic scales', () => {
    const kind = listKinds().find(item => item.kind === 'levels')!
    const { result } = evaluate({ kind: 'levels', input: kind.exampleInput })
    expect(presentResult('levels', result, { scale: 'linear' }).chart!.alt).toMatch(/linear/)
    expect(presentResult('levels', result, { scale: 'log' }).chart!.alt).toMatch(/log/)
  })

  it('lists the first levels of a large level table, from typed or plain columns, and says how many there are', () => {
    const count = 20_000
    const energies = Float64Array.from({ length: count }, (_, index) => index * 0.5)
    const { result } = evaluate({ kind: 'levels', input: { levelTable: { energyUnit: 'cm^-1', energies }, temperature: '300 K' } })
    const presented = presentResult('levels', result)
    const table = presented.tables[0]!
    expect(table.rows).toHaveLength(LEVEL_TABLE_ROWS_SHOWN)
    expect(table.caption).toContain('20,000')
    expect(table.rows[1]![1]).toBe('0.5 cm^-1')
    expect(screenNumber(table.rows[0]![3]!)).toBeCloseTo(result.levelTable.fractions[0], 8)
    const fromJson = presentResult('levels', JSON.parse(JSON.stringify(result)))
    expect(fromJson.tables[0]!.rows).toEqual(table.rows)
  })

  it('names the levels of a level table by their labels and charts a table of up to 5,000 levels', () => {
    const input = { levelTable: { energyUnit: 'cm^-1', energies: [0, 120, 300], degeneracies: [1, 3, 5], labels: ['J = 0', 'J = 1', 'J = 2'] }, temperature: '200 K' }
    const { result } = evaluate({ kind: 'levels', input })
    expect(JSON.parse(JSON.stringify(result)).levelTable.labels).toEqual(['J = 0', 'J = 1', 'J = 2'])
    const presented = presentResult('levels', result)
    expect(presented.tables[0]!.rows.map(row => row[0])).toEqual(['J = 0', 'J = 1', 'J = 2'])
    expect(presented.chart?.svg).toMatch(/^<svg/)
    const big = evaluate({ kind: 'levels', input: { levelTable: { energyUnit: 'cm^-1', energies: Float64Array.from({ length: 6000 }, (_, index) => index) }, temperature: '300 K' } })
    expect(presentResult('levels', big.result).chart).toBeNull()
  })
})

