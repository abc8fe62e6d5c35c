/** The plain description of a presented result: what the page, the PDF, the CSV and the API render. */
import type { ChartOutput } from '../charts'

export interface PresentedRow {
  /** Path of the value in the result or input (levels[1].fraction), for tests and copy. */
  key: string
  /** In words, capitalised: 'Molar entropy'. */
  label: string
  symbol?: string
  /** Rounded for reading (rounded to the uncertainty where there is one). */
  value: string
  unit?: string
  /** The standard uncertainty, rounded with the value. */
  uncertainty?: string
  /** Input rows: the SI value the engine used for what was typed. */
  si?: string
  /** Full precision, for the copy action. */
  exact?: string
}

export interface PresentedSection {
  title: string
  rows: PresentedRow[]
}

export interface PresentedColumn {
  label: string
  symbol?: string
  unit?: string
  numeric: boolean
}

export interface PresentedTable {
  caption: string
  columns: PresentedColumn[]
  /** Rounded cells, one array per row (at most the rows shown). */
  rows: string[][]
  /** The same cells at full precision (the CSV). */
  exact: string[][]
  /** Rows in the result; more than `rows.length` when the table is cut for reading. */
  totalRows: number
  /** File-name stem for the table's CSV. */
  name: string
}

export interface PresentedChart extends ChartOutput {
  title: string
}

export interface Presentation {
  kind: string
  /** The kind's title ('Vibrational ladder'). */
  title: string
  /** The model in words, for the reader who must know what the numbers assume. */
  model: string
  inputs: PresentedSection
  inputTables: PresentedTable[]
  sections: PresentedSection[]
  tables: PresentedTable[]
  charts: PresentedChart[]
  warnings: string[]
  /** Whether population charts offer a linear/logarithmic choice. */
  scalable: boolean
  /** The display choices used, stated with the numbers (the PDF prints this). */
  conventions: string
}

export interface PresentPreferences {
  /** Significant figures for values without an uncertainty, 4–10 (default 6). */
  significantFigures?: number
  /** Population chart scale. */
  scale?: 'linear' | 'log'
  /** Chart drawing size in SVG units. */
  chartWidth?: number
  chartHeight?: number
}

/** A column header as printed: 'Fraction p', 'Energy E (cm⁻¹)'. */
export function columnHeader(column: PresentedColumn): string {
  return `${column.label}${column.symbol ? ` ${column.symbol}` : ''}${column.unit ? ` (${column.unit})` : ''}`
}
