/**
 * A block's input as the scientist typed it, each quantity with the SI value the engine used
 * beside it. Labels come from the block forms (what the person typed into), with words for the
 * fields no form shows.
 */
import { BLOCK_FORMS, readPath, type FieldSpec } from '../editor/blockForms'
import { registry } from '../thermo'
import { formatInteger, formatSignificant } from './numbers'
import type { PresentedRow, PresentedTable } from './types'

/** Input fields no block form edits (level tables, microstates on levels, extra line columns). */
const EXTRA_FIELDS: Record<string, FieldSpec[]> = {
  microstates: [
    { key: 'levels.particles', label: 'Particles N', type: 'integer' },
    { key: 'levels.totalEnergy', label: 'Total energy', type: 'quantity' },
    { key: 'levels.energies', label: 'Level energies', type: 'list' },
  ],
  sweep: [{ key: 'parameter', label: 'Parameter swept', type: 'text' }],
  thermochemistry: [
    {
      key: 'electronicLevels', label: 'Electronic levels', type: 'table', rowName: 'level', newRow: {},
      columns: [{ key: 'energy', label: 'Energy', type: 'quantity' }, { key: 'degeneracy', label: 'Degeneracy', type: 'integer' }],
    },
  ],
}
const EXTRA_COLUMNS: Record<string, { key: string, label: string }[]> = {
  lines: [{ key: 'wavelengthFactor', label: 'Wavelength factor λ' }],
}

/** SI units of parsed input numbers, by field name (the engine converts each once, DESIGN "units at the edge"). */
const SI_UNITS: Record<string, string> = {
  temperature: 'K', start: 'K', stop: 'K', lower: 'K', upper: 'K', pressure: 'Pa', field: 'T', larmorFrequency: 'Hz',
  molarMass: 'kg/mol', gyromagneticRatio: 'rad s⁻¹ T⁻¹', amount: 'particles',
}

const isRecord = (value: unknown): value is Record<string, unknown> => value !== null && typeof value === 'object' && !Array.isArray(value)

/** The SI value the engine used for a typed quantity, or '' when the text was the value. */
function siText(key: string, typed: unknown, parsed: unknown, digits: number): string {
  if (typeof typed !== 'string') return ''
  if (isRecord(parsed) && typeof parsed.joules === 'number') return `${formatSignificant(parsed.joules, digits)} J`
  if (isRecord(parsed) && typeof parsed.factor === 'number') return `1 ${typed.trim()} = ${formatSignificant(parsed.factor, digits)} J`
  if (typeof parsed === 'number' && SI_UNITS[key]) return `${formatSignificant(parsed, digits)} ${SI_UNITS[key]}`
  return ''
}

function typedText(value: unknown, field?: FieldSpec): string {
  if (value === undefined || value === null || value === '') return '—'
  if (field?.type === 'select') {
    const option = field.options.find(item => item.value === value)
    if (option && option.label !== String(value)) return `${option.label}`
  }
  if (typeof value === 'string') return value
  if (typeof value === 'number') return String(value)
  if (typeof value === 'boolean') return value ? 'yes' : 'no'
  if (Array.isArray(value) && value.every(item => typeof item !== 'object')) return value.map(String).join(', ')
  return JSON.stringify(value)
}

export interface PresentedInputs {
  rows: PresentedRow[]
  tables: PresentedTable[]
}

/** Lists of rows a block form edits as a table, and level tables summarised. */
function tableOf(kind: string, field: Extract<FieldSpec, { type: 'table' }>, typedRows: unknown[], parsedRows: unknown, digits: number, prefix: string): PresentedTable {
  const columns = [...field.columns.map(column => ({ key: column.key, label: column.label })), ...(EXTRA_COLUMNS[field.key] ?? [])]
  const used = columns.filter(column => typedRows.some(row => isRecord(row) && row[column.key] !== undefined))
  const rows = typedRows.map((row, index) => used.map((column) => {
    const typed = isRecord(row) ? row[column.key] : undefined
    const parsed = Array.isArray(parsedRows) && isRecord(parsedRows[index]) ? (parsedRows[index] as Record<string, unknown>)[column.key] : undefined
    const si = siText(column.key, typed, parsed, digits)
    return si ? `${typedText(typed)} (${si})` : typedText(typed)
  }))
  return {
    caption: `${prefix}${field.label}, as typed`,
    columns: [{ label: '#', numeric: true }, ...used.map(column => ({ label: column.label, numeric: false }))],
    rows: rows.map((cells, index) => [String(index + 1), ...cells]),
    exact: rows.map((cells, index) => [String(index + 1), ...used.map(column => typedText(isRecord(typedRows[index]) ? (typedRows[index] as Record<string, unknown>)[column.key] : undefined))]),
    totalRows: rows.length,
    name: `${kind}-input-${field.key}`,
  }
}

/** The input as typed, with SI values; `prefix` names a nested input (a sweep's base input). */
export function presentInputs(kind: string, input: unknown, digits: number, prefix = ''): PresentedInputs {
  const rows: PresentedRow[] = []
  const tables: PresentedTable[] = []
  if (!isRecord(input)) return { rows, tables }
  const definition = registry[kind]
  const parsed = definition?.schema.safeParse(input)
  const data: Record<string, unknown> = parsed?.success && isRecord(parsed.data) ? parsed.data : {}
  const fields = [...(BLOCK_FORMS[kind] ?? []), ...(EXTRA_FIELDS[kind] ?? [])]
  for (const field of fields) {
    const typed = readPath(input, field.key)
    if (field.type === 'table') {
      if (Array.isArray(typed)) tables.push(tableOf(kind, field, typed, readPath(data, field.key), digits, prefix))
      const table = field.levelTableKey ? input[field.levelTableKey] : undefined
      if (isRecord(table)) {
        const energies = table.energies as ArrayLike<number> | undefined
        const count = energies && typeof energies.length === 'number' ? energies.length : 0
        rows.push({ key: field.levelTableKey!, label: `${prefix}Level table`, value: `${formatInteger(count)} levels, energies in ${String(table.energyUnit ?? '?')}${table.degeneracies ? ', with degeneracies' : ''}${table.labels ? ', with labels' : ''} (every number is in the signed record)` })
      }
      continue
    }
    if (typed === undefined) continue
    if (field.type === 'json' && isRecord(typed) && typeof input.kind === 'string') {
      const nested = presentInputs(input.kind, typed, digits, `${prefix}${registry[input.kind]?.title ?? input.kind}: `)
      rows.push(...nested.rows)
      tables.push(...nested.tables)
      continue
    }
    const leaf = field.key.split('.').at(-1)!
    const si = siText(leaf, typed, readPath(data, field.key), digits)
    rows.push({ key: field.key, label: `${prefix}${field.label}`, value: typedText(typed, field), ...(si ? { si } : {}) })
  }
  // The engine fills a sweep's temperature itself; anything else typed that no field names is still shown.
  const known = new Set(fields.flatMap(field => [field.key.split('.')[0], ...(field.type === 'table' && field.levelTableKey ? [field.levelTableKey] : [])]))
  for (const [key, value] of Object.entries(input)) {
    if (known.has(key)) continue
    rows.push({ key, label: `${prefix}Other input (${key})`, value: typedText(value) })
  }
  return { rows, tables }
}
