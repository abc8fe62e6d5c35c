import { describe, expect, it } from 'vitest'
import { evaluate, listKinds } from '../../../shared/thermo'
import { LEVEL_TABLE_ROWS_SHOWN, presentResult, resultQuantityAt } from '../../../shared/present'
import { RESULT_QUANTITIES } from '../../../shared/present/quantities'

/** Reads a number as formatSignificant writes it ("2.50000×10⁻⁵", "−3.00"). */
function screenNumber(text: string): number {
  const digits: Record<string, string> = { '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9', '⁻': '-' }
  const plain = text.replace(/−/g, '-').replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]/g, c => digits[c]!)
  const power = /^(-?[\d.]+)?×?10(-?\d+)$/.exec(plain)
  return power ? Number(power[1] ?? 1) * 10 ** Number(power[2]) : Number(plain)
}

/** Every scalar leaf of a result, lists by their first item, `units` left out. */
function leaves(value: unknown, path: (string | number)[] = [], out: (string | number)[][] = []) {
  if (value !== null && typeof value === 'object' && typeof (value as { length?: unknown }).length === 'number') {
    if ((value as ArrayLike<unknown>).length > 0) leaves((value as ArrayLike<unknown>)[0], [...path, 0], out)
  } else if (value !== null && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) if (key !== 'units') leaves(inner, [...path, key], out)
  } else out.push(path)
  return out
}

describe('presentResult', () => {
  it('presents every kind’s example with a model, labelled rows, tables whose rows fit their columns, and a chart where a person would look', () => {
    for (const kind of listKinds()) {
      const { result, warnings } = evaluate({ kind: kind.kind, input: kind.exampleInput })
      const presented = presentResult(kind.kind, kind.exampleInput, result, {}, warnings)
      expect(presented.model.length, kind.kind).toBeGreaterThan(20)
      expect(presented.sections[0]!.rows.length, kind.kind).toBeGreaterThan(0)
      expect(presented.inputs.rows.length + presented.inputTables.length, kind.kind).toBeGreaterThan(0)
      for (const section of presented.sections) {
        for (const row of section.rows) {
          expect(row.label, `${kind.kind} ${row.key}`).toMatch(/^[A-Z]/)
          expect(row.label, `${kind.kind} ${row.key}`).not.toMatch(/[a-z][A-Z]/) // no camelCase field names
          expect(row.value, `${kind.kind} ${row.key}`).not.toMatch(/\d{8,}\.\d/) // never a raw double
        }
      }
      for (const table of [...presented.tables, ...presented.inputTables]) {
        for (const row of table.rows) expect(row.length, `${kind.kind} ${table.caption}`).toBe(table.columns.length)
        for (const column of table.columns) expect(column.label, `${kind.kind} ${table.caption}`).not.toMatch(/[a-z][A-Z]/)
      }
      if (kind.kind !== 'solveTemperature') {
        expect(presented.charts[0]?.svg, kind.kind).toMatch(/^<svg/)
        expect(presented.charts[0]?.alt.length, kind.kind).toBeGreaterThan(10)
      }
    }
  })

  it('has a label, and a unit where the quantity has one, for every result field of every kind’s example', () => {
    // The units are those the engine documents beside its numbers (each kind's `units` map).
    for (const kind of listKinds()) {
      const { result } = evaluate({ kind: kind.kind, input: kind.exampleInput })
      expect(RESULT_QUANTITIES[kind.kind], kind.kind).toBeDefined()
      const engineUnits = (result as { units?: Record<string, string> }).units ?? {}
      for (const path of leaves(result)) {
        if (kind.kind === 'sweep' && path[0] === 'series' && path[2] === 'values') continue // named through the swept kind
        const found = resultQuantityAt(kind.kind, path, { input: kind.exampleInput, result })
        expect(found, `${kind.kind} ${path.join('.')}`).not.toBeNull()
        const leaf = String(path.filter(segment => typeof segment === 'string').at(-1))
        const engineUnit = engineUnits[leaf]
        if (engineUnit && !/dimensionless/.test(engineUnit)) expect(found!.unit, `${kind.kind} ${path.join('.')} (engine says ${engineUnit})`).toBeTruthy()
      }
    }
  })

  it('shows every mode of a vibration block, each with its ladder chart and population table', () => {
    const input = { modes: [{ label: 'stretch', wavenumber: '3657 cm^-1' }, { label: 'bend', wavenumber: '1595 cm^-1' }, { label: 'antisymmetric stretch', wavenumber: '3756 cm^-1' }], temperature: '1000 K' }
    const { result } = evaluate({ kind: 'vibration', input })
    const presented = presentResult('vibration', input, result)
    expect(presented.tables[0]!.rows.map(row => row[0])).toEqual(['stretch', 'bend', 'antisymmetric stretch'])
    for (const name of ['stretch', 'bend', 'antisymmetric stretch']) {
      expect(presented.charts.some(chart => chart.title === `Vibrational ladder of mode ${['stretch', 'bend', 'antisymmetric stretch'].indexOf(name) + 1} (${name})`), name).toBe(true)
      expect(presented.tables.some(table => table.caption.startsWith('Populations of') && table.caption.includes(`(${name})`)), name).toBe(true)
    }
  })

  it('shows inputs exactly as typed, with the SI value the engine used', () => {
    const input = { rotationalConstant: '1.9225 cm^-1', temperature: '25 degC', symmetryNumber: 1 }
    const { result } = evaluate({ kind: 'rotation', input })
    const presented = presentResult('rotation', input, result)
    const temperature = presented.inputs.rows.find(row => row.key === 'temperature')!
    expect(temperature.value).toBe('25 degC')
    // 25 °C = 298.15 K (ITS-90 definition of the Celsius scale).
    expect(temperature.si).toBe('298.150 K')
    expect(presented.inputs.rows.find(row => row.key === 'rotationalConstant')!.value).toBe('1.9225 cm^-1')
  })

  it('rounds the Boltzmann-plot temperature to its uncertainty', () => {
    const input = { lines: [
      { upperEnergy: '1000 cm^-1', degeneracy: 3, intensity: 1.0, uncertainty: 0.05 },
      { upperEnergy: '2000 cm^-1', degeneracy: 5, intensity: 0.13, uncertainty: 0.01 },
      { upperEnergy: '3000 cm^-1', degeneracy: 7, intensity: 0.017, uncertainty: 0.002 },
    ] }
    const { result } = evaluate({ kind: 'boltzmannPlot', input })
    const row = presentResult('boltzmannPlot', input, result).sections[0]!.rows.find(item => item.key === 'temperature')!
    expect(row.unit).toBe('K')
    expect(row.uncertainty).toMatch(/^\d\.?\d?$|^\d\d$|^\d+$/)
    // u to two significant figures, the value to the same place.
    const decimals = (text: string) => (text.split('.')[1] ?? '').length
    expect(decimals(row.value)).toBe(decimals(row.uncertainty!))
    expect(Math.abs(screenNumber(row.value) - result.temperature!)).toBeLessThanOrEqual(screenNumber(row.uncertainty!) / 10)
  })

  it('shows level fractions to six significant digits of the engine value', () => {
    const input = { levels: [{ energy: '0 cm^-1' }, { energy: '120 cm^-1', degeneracy: 3 }, { energy: '350 cm^-1', degeneracy: 5 }], temperature: '450 K' }
    const { result } = evaluate({ kind: 'levels', input })
    const table = presentResult('levels', input, result).tables[0]!
    const column = table.columns.findIndex(item => item.label === 'Fraction')
    table.rows.forEach((row, index) => {
      const engine = result.levels![index]!.fraction
      expect(Math.abs(screenNumber(row[column]!) - engine)).toBeLessThanOrEqual(5e-6 * engine)
      expect(Number(table.exact[index]![column])).toBe(engine)
    })
  })

  it('switches population charts between linear and logarithmic scales', () => {
    const kind = listKinds().find(item => item.kind === 'levels')!
    const { result } = evaluate({ kind: 'levels', input: kind.exampleInput })
    expect(presentResult('levels', kind.exampleInput, result, { scale: 'linear' }).charts[0]!.alt).toMatch(/linear/)
    expect(presentResult('levels', kind.exampleInput, result, { scale: 'log' }).charts[0]!.alt).toMatch(/log/)
  })

  it('lists the first levels of a large level table, from typed or plain columns, and says how many there are', () => {
    const count = 20_000
    const energies = Float64Array.from({ length: count }, (_, index) => index * 0.5)
    const input = { levelTable: { energyUnit: 'cm^-1', energies }, temperature: '300 K' }
    const { result } = evaluate({ kind: 'levels', input })
    const presented = presentResult('levels', input, result)
    const table = presented.tables[0]!
    expect(table.rows).toHaveLength(LEVEL_TABLE_ROWS_SHOWN)
    expect(table.totalRows).toBe(count)
    expect(table.caption).toContain('20,000')
    expect(table.rows[1]![1]).toBe('0.500000')
    expect(table.columns[1]!.unit).toBe('cm⁻¹')
    expect(screenNumber(table.rows[0]![3]!)).toBeCloseTo(result.levelTable!.fractions[0]!, 8)
    const fromJson = presentResult('levels', input, JSON.parse(JSON.stringify(result)))
    expect(fromJson.tables[0]!.rows).toEqual(table.rows)
  })

  it('names the levels of a level table by their labels and charts a table of up to 5,000 levels', () => {
    const input = { levelTable: { energyUnit: 'cm^-1', energies: [0, 120, 300], degeneracies: [1, 3, 5], labels: ['J = 0', 'J = 1', 'J = 2'] }, temperature: '200 K' }
    const { result } = evaluate({ kind: 'levels', input })
    const presented = presentResult('levels', input, result)
    expect(presented.tables[0]!.rows.map(row => row[0])).toEqual(['J = 0', 'J = 1', 'J = 2'])
    expect(presented.charts[0]?.svg).toMatch(/^<svg/)
    const bigInput = { levelTable: { energyUnit: 'cm^-1', energies: Float64Array.from({ length: 6000 }, (_, index) => index) }, temperature: '300 K' }
    const big = evaluate({ kind: 'levels', input: bigInput })
    expect(presentResult('levels', bigInput, big.result).charts).toHaveLength(0)
  })
})

describe('presentedTableCsv', () => {
  it('writes units in the header row and full-precision numbers in the cells', async () => {
    const { presentedTableCsv } = await import('../../../shared/present')
    const input = { lines: [
      { label: 'line A, blue', upperEnergy: '1000 cm^-1', degeneracy: 3, intensity: 1.0 },
      { upperEnergy: '2000 cm^-1', degeneracy: 5, intensity: 0.13 },
      { upperEnergy: '3000 cm^-1', degeneracy: 7, intensity: 0.017 },
    ] }
    const { result } = evaluate({ kind: 'boltzmannPlot', input })
    const csv = presentedTableCsv(presentResult('boltzmannPlot', input, result).tables[0]!)
    const [header, first] = csv.split('\r\n')
    expect(header).toContain('Upper-level energy E_u (cm⁻¹)')
    expect(header).toContain('Residual y − ŷ')
    expect(first!.startsWith('"line A, blue",1000')).toBe(true)
    expect(first).toContain(String(result.points[0].residual))
  })
})
