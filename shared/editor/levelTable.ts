/**
 * A `levels` block in its level-table form (`input.levelTable`: energies, degeneracies and labels
 * as parallel lists, see shared/thermo/kinds/levels.ts): how large it may grow in the editor, what
 * the block shows of it instead of a row per level, and its rows form when it is short enough to
 * edit one level at a time. Pure: the block form, the read-only view and the import dialog use it.
 */

/**
 * Most levels a block edits as rows. A levels import with more rows than this becomes a level
 * table (an editable row per level stops being useful past a screenful or two, and each row is
 * a set of live form fields), and only a level table this short can be turned into rows.
 */
export const LEVEL_ROWS_EDITABLE_MAX = 500

/**
 * Most levels one import puts in a level table, so that the saved entry stays well inside the
 * server's default 1 MB JSON body limit (THERMOTOME_BODY_LIMIT). Measured: about 11 bytes of
 * JSON per level for energies alone, 15 with degeneracies, 28 with degeneracies and short
 * labels ("v=3 J=41"), 35 with energies at full double precision; 20,000 levels with short
 * labels are about 560 KB, leaving room for the entry's text and other blocks.
 */
export const LEVEL_TABLE_IMPORT_MAX = 20_000

/**
 * Most JSON bytes one imported level table may take: long labels can make a table under
 * LEVEL_TABLE_IMPORT_MAX levels too large to save. Three quarters of the default body limit.
 */
export const LEVEL_TABLE_JSON_BYTES_MAX = 768 * 1024

/** What the block shows of a level table instead of its rows. */
export interface LevelTableSummary {
  count: number
  energyUnit: string
  /** Lowest and highest energy in energyUnit (null when no entry is a finite number). */
  lowest: number | null
  highest: number | null
  hasDegeneracies: boolean
  hasLabels: boolean
}

const isRecord = (value: unknown): value is Record<string, unknown> =>
  value !== null && typeof value === 'object' && !Array.isArray(value)

const isList = (value: unknown): value is ArrayLike<unknown> =>
  Array.isArray(value) || ArrayBuffer.isView(value)

/**
 * Counts and range of a level table as stored in a block's input, or null when the value is
 * not a table with a list of energies. Entries that are not finite numbers are skipped here;
 * the engine names them (`levelTable.energies[12]`).
 */
export function levelTableSummary(value: unknown): LevelTableSummary | null {
  if (!isRecord(value) || !isList(value.energies)) return null
  const energies = value.energies
  let lowest = Infinity
  let highest = -Infinity
  for (let index = 0; index < energies.length; index++) {
    const energy = energies[index]
    if (typeof energy !== 'number' || energy - energy !== 0) continue
    if (energy < lowest) lowest = energy
    if (energy > highest) highest = energy
  }
  const found = lowest <= highest
  return {
    count: energies.length,
    energyUnit: typeof value.energyUnit === 'string' ? value.energyUnit : '',
    lowest: found ? lowest : null,
    highest: found ? highest : null,
    hasDegeneracies: isList(value.degeneracies),
    hasLabels: isList(value.labels),
  }
}

/** A level row as the block's row table holds it (the rows form of the `levels` input). */
export interface LevelRow { label?: string, energy: string, degeneracy?: number }

/**
 * The rows form of a level table: each energy written with the table's unit ("2143.3 cm^-1"),
 * degeneracies and non-empty labels kept. The engine reads both forms to the same populations.
 */
export function levelTableToRows(value: unknown): LevelRow[] {
  if (!isRecord(value) || !isList(value.energies)) return []
  const unit = typeof value.energyUnit === 'string' ? value.energyUnit.trim() : ''
  const degeneracies = isList(value.degeneracies) ? value.degeneracies : null
  const labels = isList(value.labels) ? value.labels : null
  const energies = value.energies
  return Array.from({ length: energies.length }, (_, index) => {
    const row: LevelRow = { energy: `${String(energies[index])} ${unit}`.trim() }
    const label = labels?.[index]
    if (typeof label === 'string' && label !== '') row.label = label
    const degeneracy = degeneracies?.[index]
    if (degeneracy !== undefined) row.degeneracy = degeneracy as number
    return row
  })
}

/** Bytes of the level table's JSON (UTF-8), as it adds to the saved entry. */
export function levelTableJsonBytes(table: unknown): number {
  return new TextEncoder().encode(JSON.stringify(table)).length
}

/** Whole numbers with thousands separators, as the block and the dialog write counts. */
export function countText(count: number): string {
  return count.toLocaleString('en-US')
}
