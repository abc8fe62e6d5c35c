import { describe, expect, it } from 'vitest'
import { evaluate } from '#shared/thermo'
import { guessMapping, ImportMappingError, isNumericCell, looksLikeHeader, mapLevels, mapLevelTable, mapLines, parseTable } from '#shared/import/csv'

describe('parseTable: delimiters', () => {
  it('reads a comma-separated table with a header', () => {
    const table = parseTable('label,energy,g\nground,0,1\nfirst,1234.5,3\n')
    expect(table.delimiter).toBe(',')
    expect(table.hasHeader).toBe(true)
    expect(table.headers).toEqual(['label', 'energy', 'g'])
    expect(table.rows).toEqual([['ground', '0', '1'], ['first', '1234.5', '3']])
    expect(table.rowNumbers).toEqual([2, 3])
    expect(table.totalRows).toBe(2)
  })

  it('detects tabs, semicolons and vertical bars', () => {
    expect(parseTable('E\tg\n0\t1\n100\t3').delimiter).toBe('\t')
    expect(parseTable('E;g\n0;1\n100;3').delimiter).toBe(';')
    expect(parseTable('E|g\n0|1\n100|3').delimiter).toBe('|')
  })

  it('reads whitespace-aligned text output as columns', () => {
    const table = parseTable('#  E/cm-1   g\n   0.000    1\n 667.380    2\n1285.400    1\n')
    expect(table.delimiter).toBe(' ')
    expect(table.hasHeader).toBe(false)
    expect(table.rows).toEqual([['0.000', '1'], ['667.380', '2'], ['1285.400', '1']])
    // The comment is row 1 of the file, so the data rows are 2 to 4.
    expect(table.rowNumbers).toEqual([2, 3, 4])
  })

  it('honours a delimiter chosen by the person', () => {
    const table = parseTable('a;b,c\n1;2,3', { delimiter: ';', hasHeader: false })
    expect(table.rows[0]).toEqual(['a', 'b,c'])
  })

  it('keeps quoted fields with delimiters, quotes and line breaks in one cell (RFC 4180)', () => {
    const text = 'label,energy\n"v=1, J=0",2143.3\n"the ""hot"" band",4260.1\n"two\nlines",100\n'
    const table = parseTable(text)
    expect(table.rows).toEqual([['v=1, J=0', '2143.3'], ['the "hot" band', '4260.1'], ['two\nlines', '100']])
    expect(table.rowNumbers).toEqual([2, 3, 4])
  })

  it('reads a spreadsheet export: byte-order mark, CRLF line ends, blank rows', () => {
    const text = '\uFEFFLevel,Energy (cm^-1),Degeneracy\r\nX,0,1\r\n\r\nA,1500.25,2\r\n'
    const table = parseTable(text)
    expect(table.headers).toEqual(['Level', 'Energy (cm^-1)', 'Degeneracy'])
    expect(table.rows).toEqual([['X', '0', '1'], ['A', '1500.25', '2']])
    // The blank line is row 3 in the spreadsheet; the next data row is row 4.
    expect(table.rowNumbers).toEqual([2, 4])
  })

  it('keeps at most maxRows rows but counts them all', () => {
    const text = ['E', ...Array.from({ length: 120 }, (_, index) => String(index * 10))].join('\n')
    const table = parseTable(text, { maxRows: 50 })
    expect(table.rows).toHaveLength(50)
    expect(table.totalRows).toBe(120)
  })

  it('pads short rows and names unnamed columns', () => {
    const table = parseTable('1,2,3\n4,5\n')
    expect(table.hasHeader).toBe(false)
    expect(table.headers).toEqual(['Column 1', 'Column 2', 'Column 3'])
    expect(table.rows[1]).toEqual(['4', '5', ''])
  })

  it('gives an empty table for empty text', () => {
    const table = parseTable('')
    expect(table.rows).toEqual([])
    expect(table.headers).toEqual([])
    expect(table.hasHeader).toBe(false)
  })
})

describe('header detection', () => {
  it('takes a text first row over numeric rows as the header', () => {
    expect(looksLikeHeader(['E', 'g'], [['0', '1'], ['10', '3']])).toBe(true)
  })

  it('does not take a numeric first row as the header', () => {
    expect(looksLikeHeader(['0', '1'], [['10', '3'], ['20', '5']])).toBe(false)
    expect(parseTable('0,1\n10,3\n').hasHeader).toBe(false)
  })

  it('tolerates a label column in the data rows (mostly numeric)', () => {
    expect(parseTable('name,E,g\nX,0,1\nA,10,3\n').hasHeader).toBe(true)
  })

  it('does not call a table of words a header', () => {
    expect(looksLikeHeader(['a', 'b'], [['c', 'd']])).toBe(false)
  })

  it('can be overridden', () => {
    const table = parseTable('E,g\n0,1\n', { hasHeader: false })
    expect(table.hasHeader).toBe(false)
    expect(table.rows).toEqual([['E', 'g'], ['0', '1']])
    expect(table.rowNumbers).toEqual([1, 2])
  })

  it('recognises plain and scientific numbers only', () => {
    for (const cell of ['0', '-1.5', '+2', '.5', '1e-3', '6.02E23', ' 7 '])
      expect(isNumericCell(cell), cell).toBe(true)
    for (const cell of ['', 'abc', '1,5', '1 cm^-1', 'NaN', 'Infinity', '0x10'])
      expect(isNumericCell(cell), cell).toBe(false)
  })
})

describe('mapLevels', () => {
  const table = parseTable('label,energy,g\nground,0,1\nfirst,1234.5,3\nsecond,+2.5e3,\n')

  it('appends the unit to the energy as written and reads degeneracies', () => {
    const result = mapLevels(table, { energyColumn: 'energy', energyUnit: 'cm^-1', degeneracyColumn: 'g', labelColumn: 'label' })
    expect(result.errors).toEqual([])
    expect(result.rows).toEqual([
      { label: 'ground', energy: '0 cm^-1', degeneracy: 1 },
      { label: 'first', energy: '1234.5 cm^-1', degeneracy: 3 },
      { label: 'second', energy: '2.5e3 cm^-1' },
    ])
  })

  it('accepts columns by index and other units', () => {
    const result = mapLevels(table, { energyColumn: 1, energyUnit: 'kJ/mol' })
    expect(result.rows.map(row => row.energy)).toEqual(['0 kJ/mol', '1234.5 kJ/mol', '2.5e3 kJ/mol'])
  })

  it('names the row (as in the file) and the column of each bad cell', () => {
    const bad = parseTable('label,energy,g\r\nX,0,1\r\n\r\nA,abc,2\r\nB,100,1.5\r\nC,,1\r\n')
    const result = mapLevels(bad, { energyColumn: 'energy', energyUnit: 'eV', degeneracyColumn: 'g' })
    expect(result.rows).toEqual([{ energy: '0 eV', degeneracy: 1 }])
    expect(result.errors).toEqual([
      { row: 4, column: 'energy', message: 'the energy "abc" is not a number' },
      { row: 5, column: 'g', message: 'the degeneracy "1.5" is not a whole number of at least 1' },
      { row: 6, column: 'energy', message: 'the energy is empty' },
    ])
  })

  it('refuses a mapping to a column that does not exist or an unknown unit', () => {
    expect(() => mapLevels(table, { energyColumn: 'wavenumber', energyUnit: 'cm^-1' })).toThrow(ImportMappingError)
    expect(() => mapLevels(table, { energyColumn: 7, energyUnit: 'cm^-1' })).toThrow(/energyColumn/)
    expect(() => mapLevels(table, { energyColumn: 1, energyUnit: 'furlongs' as 'K' })).toThrow(/energyUnit/)
  })

  it('produces rows the engine reads exactly like hand-typed levels (levels kind)', () => {
    const { rows } = mapLevels(table, { energyColumn: 'energy', energyUnit: 'cm^-1', degeneracyColumn: 'g', labelColumn: 'label' })
    const imported = evaluate({ kind: 'levels', input: { temperature: '300 K', levels: rows } })
    const typed = evaluate({ kind: 'levels', input: { temperature: '300 K', levels: [
      { label: 'ground', energy: '0 cm^-1', degeneracy: 1 },
      { label: 'first', energy: '1234.5 cm^-1', degeneracy: 3 },
      { label: 'second', energy: '2.5e3 cm^-1' },
    ] } })
    expect(imported.result).toEqual(typed.result)
  })
})

describe('mapLevelTable', () => {
  const table = parseTable('label,energy,g\nground,0,1\nfirst,1234.5,3\nsecond,+2.5e3,\n')

  it('parses energies and degeneracies into parallel number lists, with labels when a label column is chosen', () => {
    const result = mapLevelTable(table, { energyColumn: 'energy', energyUnit: 'cm^-1', degeneracyColumn: 'g', labelColumn: 'label' })
    expect(result.errors).toEqual([])
    // An empty degeneracy cell counts the level once, as a row without a degeneracy does.
    expect(result.levelTable).toEqual({ energyUnit: 'cm^-1', energies: [0, 1234.5, 2500], degeneracies: [1, 3, 1], labels: ['ground', 'first', 'second'] })
  })

  it('leaves out degeneracies and labels when no column is chosen for them', () => {
    const result = mapLevelTable(table, { energyColumn: 1, energyUnit: 'eV' })
    expect(result.levelTable).toEqual({ energyUnit: 'eV', energies: [0, 1234.5, 2500] })
    expect(Object.keys(result.levelTable)).toEqual(['energyUnit', 'energies'])
  })

  it('names the row (as in the file) and the column of each bad cell, and leaves those rows out of every list', () => {
    const bad = parseTable('label,energy,g\r\nX,0,1\r\n\r\nA,abc,2\r\nB,100,1.5\r\nC,,1\r\nD,250,0\r\nE,300,2\r\n')
    const result = mapLevelTable(bad, { energyColumn: 'energy', energyUnit: 'cm^-1', degeneracyColumn: 'g', labelColumn: 'label' })
    // The same words as mapLevels, so the dialog lists both alike.
    expect(result.errors).toEqual([
      { row: 4, column: 'energy', message: 'the energy "abc" is not a number' },
      { row: 5, column: 'g', message: 'the degeneracy "1.5" is not a whole number of at least 1' },
      { row: 6, column: 'energy', message: 'the energy is empty' },
      { row: 7, column: 'g', message: 'the degeneracy "0" is not a whole number of at least 1' },
    ])
    expect(result.levelTable).toEqual({ energyUnit: 'cm^-1', energies: [0, 300], degeneracies: [1, 2], labels: ['X', 'E'] })
    expect(mapLevels(bad, { energyColumn: 'energy', energyUnit: 'cm^-1', degeneracyColumn: 'g', labelColumn: 'label' }).errors).toEqual(result.errors)
  })

  it('refuses a mapping to a column that does not exist or an unknown unit', () => {
    expect(() => mapLevelTable(table, { energyColumn: 'wavenumber', energyUnit: 'cm^-1' })).toThrow(ImportMappingError)
    expect(() => mapLevelTable(table, { energyColumn: 1, energyUnit: 'cm^-1', labelColumn: 9 })).toThrow(/labelColumn/)
    expect(() => mapLevelTable(table, { energyColumn: 1, energyUnit: 'furlongs' as 'K' })).toThrow(/energyUnit/)
  })

  it('gives a level table the engine reads to the same populations as the imported rows (levels kind)', () => {
    const mapping = { energyColumn: 'energy', energyUnit: 'cm^-1', degeneracyColumn: 'g', labelColumn: 'label' } as const
    const rows = evaluate({ kind: 'levels', input: { temperature: '1500 K', levels: mapLevels(table, mapping).rows } }).result
    const columns = evaluate({ kind: 'levels', input: { temperature: '1500 K', levelTable: mapLevelTable(table, mapping).levelTable } }).result
    rows.levels.forEach((level: { fraction: number }, index: number) => expect(columns.levelTable.fractions[index]).toBeCloseTo(level.fraction, 14))
    expect(columns.molarEntropy).toBeCloseTo(rows.molarEntropy, 10)
    expect(columns.mostPopulated).toEqual(rows.mostPopulated)
  })
})

describe('mapLines', () => {
  const text = 'line\tE_upper (cm^-1)\tg_u\tintensity\tsigma\nR(0)\t3.8\t3\t0.82\t0.01\nR(1)\t11.5\t5\t1.21\t\nR(2)\t23.0\t7\t-1\t0.02\n'

  it('reads upper energies, degeneracies, intensities and optional uncertainties', () => {
    const table = parseTable(text)
    expect(table.delimiter).toBe('\t')
    const mapping = guessMapping(table, 'lines')
    expect(mapping).toMatchObject({ energyColumn: 1, degeneracyColumn: 2, intensityColumn: 3, uncertaintyColumn: 4, labelColumn: 0, energyUnit: 'cm^-1' })
    const result = mapLines(table, { energyUnit: 'cm^-1', ...mapping } as Parameters<typeof mapLines>[1])
    expect(result.rows).toEqual([
      { label: 'R(0)', upperEnergy: '3.8 cm^-1', degeneracy: 3, intensity: 0.82, uncertainty: 0.01 },
      { label: 'R(1)', upperEnergy: '11.5 cm^-1', degeneracy: 5, intensity: 1.21 },
    ])
    expect(result.errors).toEqual([{ row: 4, column: 'intensity', message: 'the intensity "-1" is not a number above zero' }])
  })

  it('needs degeneracy and intensity columns', () => {
    const table = parseTable(text)
    expect(() => mapLines(table, { energyColumn: 1, energyUnit: 'cm^-1', intensityColumn: 3 })).toThrow(/degeneracyColumn/)
  })
})

describe('guessMapping', () => {
  it('reads the unit from a header such as "Energy (eV)"', () => {
    const table = parseTable('Level,Energy (eV),Degeneracy\nX,0,1\nA,1.2,2\n')
    expect(guessMapping(table, 'levels')).toMatchObject({ energyColumn: 1, energyUnit: 'eV', degeneracyColumn: 2, labelColumn: 0 })
  })
})
