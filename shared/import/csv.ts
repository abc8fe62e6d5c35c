/**
 * Tables from data files (CSV, TSV, whitespace-separated text) for the import into a level or
 * line table. Pure: parsing by Papa Parse (RFC 4180 quoting), used by the browser dialog and the
 * server's preview route alike.
 *
 * Row numbers are 1-based and count records as a spreadsheet shows them (blank and comment rows
 * included), so an error message points at the row a person sees when they open the file.
 */
import Papa from 'papaparse'

/** Delimiters a table may use; ' ' means "runs of spaces or tabs" (fixed-width text output). */
export type TableDelimiter = ',' | '\t' | ';' | '|' | ' '

export interface ParseTableOptions {
  /** A delimiter, or 'auto' (the default) to detect it. */
  delimiter?: TableDelimiter | 'auto'
  /** true / false to say whether the first row holds column names, or 'auto' (the default). */
  hasHeader?: boolean | 'auto'
  /** Keep at most this many data rows (the rest are counted in `totalRows`). */
  maxRows?: number
}

export interface ParsedTable {
  /** Column names: from the header row, or "Column 1", "Column 2", … */
  headers: string[]
  /** Data rows, trimmed cells, padded to the header width. */
  rows: string[][]
  /** For each data row, its row number in the file (1-based). */
  rowNumbers: number[]
  delimiter: TableDelimiter
  hasHeader: boolean
  /** Data rows in the file (before maxRows). */
  totalRows: number
}

const DELIMITER_NAMES: Record<TableDelimiter, string> = {
  ',': 'comma',
  '\t': 'tab',
  ';': 'semicolon',
  '|': 'vertical bar',
  ' ': 'spaces',
}

export function delimiterName(delimiter: TableDelimiter): string {
  return DELIMITER_NAMES[delimiter]
}

const NUMBER = /^[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?$/

/** A cell holding one plain decimal number (scientific notation allowed). */
export function isNumericCell(cell: string): boolean {
  return NUMBER.test(cell.trim())
}

function numericShare(row: string[]): number {
  const filled = row.filter(cell => cell.trim() !== '')
  if (filled.length === 0)
    return 0
  return filled.filter(isNumericCell).length / filled.length
}

/**
 * Header detection: the first row is mostly non-numeric (under half of its cells are numbers)
 * while the rows after it are mostly numeric.
 */
export function looksLikeHeader(first: string[], following: string[][]): boolean {
  if (following.length === 0)
    return false
  const firstShare = numericShare(first)
  const sample = following.slice(0, 20)
  const followingShare = sample.reduce((sum, row) => sum + numericShare(row), 0) / sample.length
  return firstShare < 0.5 && followingShare >= 0.5 && followingShare > firstShare
}

function isBlank(record: string[]): boolean {
  return record.every(cell => cell.trim() === '')
}

function isComment(record: string[]): boolean {
  return (record[0] ?? '').trimStart().startsWith('#')
}

/** Splits whitespace-separated text: one record per line, cells separated by runs of blanks. */
function splitOnWhitespace(text: string): string[][] {
  return text.split(/\r\n|\r|\n/).map(line => (line.trim() === '' ? [''] : line.trim().split(/[ \t]+/)))
}

function parseWith(text: string, delimiter: Exclude<TableDelimiter, ' '>): string[][] {
  const result = Papa.parse<string[]>(text, { delimiter, skipEmptyLines: false, header: false, dynamicTyping: false })
  const records = result.data
  // Papa Parse yields one empty record for a final line break; it is not a row of the file.
  if (records.length > 0 && text.endsWith('\n') && isBlank(records.at(-1)!) && records.at(-1)!.length <= 1)
    records.pop()
  return records
}

/** Picks the delimiter whose split gives the most consistent number of columns (>1). */
function detectDelimiter(text: string): TableDelimiter {
  const sampleLines = text.split(/\r\n|\r|\n/).filter(line => line.trim() !== '' && !line.trimStart().startsWith('#')).slice(0, 30)
  const sample = sampleLines.join('\n')
  let best: { delimiter: TableDelimiter, score: number } = { delimiter: ',', score: 0 }
  for (const delimiter of [',', '\t', ';', '|'] as const) {
    const records = parseWith(sample, delimiter).filter(record => !isBlank(record))
    if (records.length === 0)
      continue
    const counts = records.map(record => record.length)
    const first = counts[0]!
    if (first < 2)
      continue
    const consistent = counts.filter(count => count === first).length / counts.length
    const score = consistent * 100 + first
    if (score > best.score)
      best = { delimiter, score }
  }
  if (best.score > 0)
    return best.delimiter
  return sampleLines.some(line => /\S[ \t]+\S/.test(line)) ? ' ' : ','
}

/** Parses delimited text into a table; a BOM and CRLF line ends (spreadsheet exports) are fine. */
export function parseTable(input: string, options: ParseTableOptions = {}): ParsedTable {
  const text = input.replace(/^\uFEFF/, '')
  const delimiter = !options.delimiter || options.delimiter === 'auto' ? detectDelimiter(text) : options.delimiter
  const records = delimiter === ' ' ? splitOnWhitespace(text) : parseWith(text, delimiter)

  const kept: { row: number, cells: string[] }[] = []
  records.forEach((record, index) => {
    if (!isBlank(record) && !isComment(record))
      kept.push({ row: index + 1, cells: record.map(cell => cell.trim()) })
  })

  const first = kept[0]
  const hasHeader = first === undefined
    ? false
    : options.hasHeader === undefined || options.hasHeader === 'auto'
      ? looksLikeHeader(first.cells, kept.slice(1).map(item => item.cells))
      : options.hasHeader
  const data = hasHeader ? kept.slice(1) : kept
  const width = Math.max(0, ...kept.map(item => item.cells.length))
  const headers = Array.from({ length: width }, (_, index) => {
    const name = hasHeader ? first!.cells[index]?.trim() : ''
    return name || `Column ${index + 1}`
  })
  const limit = options.maxRows ?? Number.POSITIVE_INFINITY
  const shown = data.slice(0, limit)
  return {
    headers,
    rows: shown.map(item => Array.from({ length: width }, (_, index) => item.cells[index] ?? '')),
    rowNumbers: shown.map(item => item.row),
    delimiter,
    hasHeader,
    totalRows: data.length,
  }
}

// ---------------------------------------------------------------------------------------
// Column mapping

/** Energy units offered for an imported column; each is a unit text the engine parses. */
export const IMPORT_ENERGY_UNITS = ['cm^-1', 'eV', 'meV', 'kJ/mol', 'kcal/mol', 'J/mol', 'K', 'MHz', 'GHz', 'THz', 'J'] as const
export type ImportEnergyUnit = (typeof IMPORT_ENERGY_UNITS)[number]

/** A column by its index (0-based) or by its header text. */
export type ColumnRef = number | string

export interface ColumnMapping {
  energyColumn: ColumnRef
  energyUnit: ImportEnergyUnit
  degeneracyColumn?: ColumnRef
  labelColumn?: ColumnRef
  intensityColumn?: ColumnRef
  uncertaintyColumn?: ColumnRef
}

export interface ImportRowError {
  /** Row in the file, 1-based, counted as a spreadsheet counts them. */
  row: number
  /** The column's header (or "Column N"). */
  column: string
  message: string
}

export interface ImportedLevel { label?: string, energy: string, degeneracy?: number }
export interface ImportedLine { label?: string, upperEnergy: string, degeneracy: number, intensity: number, uncertainty?: number }

export interface ImportResult<Row> {
  rows: Row[]
  errors: ImportRowError[]
}

/** Thrown for a mapping that cannot be applied at all (unknown column or unit). */
export class ImportMappingError extends Error {
  constructor(public field: string, public reason: string) {
    super(`${field}: ${reason}`)
    this.name = 'ImportMappingError'
  }
}

function resolveColumn(table: ParsedTable, reference: ColumnRef | undefined, field: string, required: boolean): number | undefined {
  if (reference === undefined || reference === '') {
    if (required)
      throw new ImportMappingError(field, 'choose a column')
    return undefined
  }
  const index = typeof reference === 'number' ? reference : table.headers.indexOf(reference)
  if (!Number.isInteger(index) || index < 0 || index >= table.headers.length)
    throw new ImportMappingError(field, `there is no column ${typeof reference === 'number' ? reference + 1 : `"${reference}"`} in this table`)
  return index
}

function checkUnit(unit: string) {
  if (!(IMPORT_ENERGY_UNITS as readonly string[]).includes(unit))
    throw new ImportMappingError('energyUnit', `choose one of ${IMPORT_ENERGY_UNITS.join(', ')}`)
}

type CellReader = (index: number | undefined) => string

function cellReader(cells: string[]): CellReader {
  return index => (index === undefined ? '' : (cells[index] ?? '').trim())
}

/** Number cell: plain decimal or scientific notation; anything else is an error for that row. */
function readNumber(value: string): number | undefined {
  if (!isNumericCell(value))
    return undefined
  const number = Number(value)
  return Number.isFinite(number) ? number : undefined
}

interface RowContext {
  row: number
  cell: CellReader
  error: (index: number, message: string) => void
}

function mapRows<Row>(table: ParsedTable, build: (context: RowContext) => Row | undefined): ImportResult<Row> {
  const rows: Row[] = []
  const errors: ImportRowError[] = []
  table.rows.forEach((cells, position) => {
    const row = table.rowNumbers[position] ?? position + 1
    let failed = false
    const context: RowContext = {
      row,
      cell: cellReader(cells),
      error: (index, message) => {
        failed = true
        errors.push({ row, column: table.headers[index] ?? `Column ${index + 1}`, message })
      },
    }
    const built = build(context)
    if (!failed && built !== undefined)
      rows.push(built)
  })
  return { rows, errors }
}

function readEnergy(context: RowContext, index: number, unit: ImportEnergyUnit, what: string): string | undefined {
  const text = context.cell(index)
  if (text === '') {
    context.error(index, `${what} is empty`)
    return undefined
  }
  const value = readNumber(text)
  if (value === undefined) {
    context.error(index, `${what} "${text}" is not a number`)
    return undefined
  }
  return `${text.replace(/^\+/, '')} ${unit}`
}

/** The degeneracy in a row's cell: undefined when there is no such column or the cell is empty (or wrong, which is reported). */
function readDegeneracy(context: RowContext, index: number | undefined): number | undefined {
  if (index === undefined) return undefined
  const text = context.cell(index)
  if (text === '') return undefined
  const value = readNumber(text)
  if (value === undefined || !Number.isInteger(value) || value < 1) {
    context.error(index, `the degeneracy "${text}" is not a whole number of at least 1`)
    return undefined
  }
  return value
}

/**
 * Rows for a `levels` block: { label?, energy: "<number> <unit>", degeneracy? }. The energy
 * keeps the number as written in the file (no float round trip) with the chosen unit appended.
 */
export function mapLevels(table: ParsedTable, mapping: ColumnMapping): ImportResult<ImportedLevel> {
  checkUnit(mapping.energyUnit)
  const energyIndex = resolveColumn(table, mapping.energyColumn, 'energyColumn', true)!
  const degeneracyIndex = resolveColumn(table, mapping.degeneracyColumn, 'degeneracyColumn', false)
  const labelIndex = resolveColumn(table, mapping.labelColumn, 'labelColumn', false)
  return mapRows(table, (context) => {
    const energy = readEnergy(context, energyIndex, mapping.energyUnit, 'the energy')
    const level: ImportedLevel = { energy: energy ?? '' }
    if (labelIndex !== undefined && context.cell(labelIndex) !== '')
      level.label = context.cell(labelIndex).slice(0, 200)
    const degeneracy = readDegeneracy(context, degeneracyIndex)
    if (degeneracy !== undefined)
      level.degeneracy = degeneracy
    return level
  })
}

/** A `levelTable` for a `levels` block: the column form, numbers parsed, one entry per level. */
export interface ImportedLevelTable {
  energyUnit: ImportEnergyUnit
  energies: number[]
  /** Only when a degeneracy column was chosen; an empty cell counts the level once (1). */
  degeneracies?: number[]
  /** Only when a label column was chosen; an empty cell gives an empty label. */
  labels?: string[]
}

export interface LevelTableImportResult {
  levelTable: ImportedLevelTable
  errors: ImportRowError[]
}

/**
 * The level-table form of `mapLevels` for long lists: energies and degeneracies as numbers in
 * parallel columns, so that a block of 10^4 levels is not 10^4 rows of text. The same checks and
 * messages as `mapLevels`, and a row with an error is left out of every column.
 */
export function mapLevelTable(table: ParsedTable, mapping: ColumnMapping): LevelTableImportResult {
  checkUnit(mapping.energyUnit)
  const energyIndex = resolveColumn(table, mapping.energyColumn, 'energyColumn', true)!
  const degeneracyIndex = resolveColumn(table, mapping.degeneracyColumn, 'degeneracyColumn', false)
  const labelIndex = resolveColumn(table, mapping.labelColumn, 'labelColumn', false)
  const { rows, errors } = mapRows(table, (context) => {
    const text = readEnergy(context, energyIndex, mapping.energyUnit, 'the energy')
    const energy = text === undefined ? Number.NaN : readNumber(context.cell(energyIndex)) ?? Number.NaN
    const degeneracy = readDegeneracy(context, degeneracyIndex) ?? 1
    return { energy, degeneracy, label: labelIndex === undefined ? '' : context.cell(labelIndex).slice(0, 200) }
  })
  const levelTable: ImportedLevelTable = { energyUnit: mapping.energyUnit, energies: rows.map(row => row.energy) }
  if (degeneracyIndex !== undefined)
    levelTable.degeneracies = rows.map(row => row.degeneracy)
  if (labelIndex !== undefined)
    levelTable.labels = rows.map(row => row.label)
  return { levelTable, errors }
}

function readPositive(context: RowContext, index: number, what: string, required: boolean): number | undefined {
  const text = context.cell(index)
  if (text === '') {
    if (required)
      context.error(index, `${what} is empty`)
    return undefined
  }
  const value = readNumber(text)
  if (value === undefined || value <= 0) {
    context.error(index, `${what} "${text}" is not a number above zero`)
    return undefined
  }
  return value
}

/**
 * Rows for a `boltzmannPlot` block (measured lines): { label?, upperEnergy, degeneracy,
 * intensity, uncertainty? }. Degeneracy and intensity columns are required.
 */
export function mapLines(table: ParsedTable, mapping: ColumnMapping): ImportResult<ImportedLine> {
  checkUnit(mapping.energyUnit)
  const energyIndex = resolveColumn(table, mapping.energyColumn, 'energyColumn', true)!
  const degeneracyIndex = resolveColumn(table, mapping.degeneracyColumn, 'degeneracyColumn', true)!
  const intensityIndex = resolveColumn(table, mapping.intensityColumn, 'intensityColumn', true)!
  const uncertaintyIndex = resolveColumn(table, mapping.uncertaintyColumn, 'uncertaintyColumn', false)
  const labelIndex = resolveColumn(table, mapping.labelColumn, 'labelColumn', false)
  return mapRows(table, (context) => {
    const upperEnergy = readEnergy(context, energyIndex, mapping.energyUnit, 'the upper energy')
    const degeneracy = readPositive(context, degeneracyIndex, 'the degeneracy', true)
    const intensity = readPositive(context, intensityIndex, 'the intensity', true)
    const line: ImportedLine = { upperEnergy: upperEnergy ?? '', degeneracy: degeneracy ?? 0, intensity: intensity ?? 0 }
    if (uncertaintyIndex !== undefined) {
      const uncertainty = readPositive(context, uncertaintyIndex, 'the uncertainty', false)
      if (uncertainty !== undefined)
        line.uncertainty = uncertainty
    }
    if (labelIndex !== undefined && context.cell(labelIndex) !== '')
      line.label = context.cell(labelIndex).slice(0, 200)
    return line
  })
}

/** A first guess at the mapping from the header names (energy, g / degeneracy, label, …). */
export function guessMapping(table: ParsedTable, target: 'levels' | 'lines'): Partial<ColumnMapping> {
  const taken = new Set<number>()
  const find = (pattern: RegExp) => {
    const index = table.headers.findIndex((header, position) => !taken.has(position) && pattern.test(header))
    if (index < 0)
      return undefined
    taken.add(index)
    return index
  }
  const energy = target === 'lines' ? find(/upper|e_?u\b|energy|term/i) ?? find(/energy|^e\b/i) : find(/energy|^e\b|term|wavenumber/i)
  const guess: Partial<ColumnMapping> = { energyColumn: energy ?? 0 }
  taken.add(guess.energyColumn as number)
  guess.degeneracyColumn = find(/degeneracy|^g(_?u)?\b|weight/i)
  if (target === 'lines') {
    guess.intensityColumn = find(/intensity|^i\b|area|signal/i)
    guess.uncertaintyColumn = find(/uncertainty|sigma|error|^u\(|^σ/i)
  }
  guess.labelColumn = find(/label|name|^line|transition|level|state|^j\b|assignment/i)
  const header = table.headers[guess.energyColumn as number] ?? ''
  const unit = IMPORT_ENERGY_UNITS.find(candidate => header.includes(`(${candidate})`) || header.includes(`[${candidate}]`))
    ?? (/cm-1|cm⁻¹|wavenumber/i.test(header) ? 'cm^-1' : undefined)
  if (unit)
    guess.energyUnit = unit
  return guess
}
