/**
 * The name, in words and with its unit, of one number inside a kind's result, found by its
 * JSON path: ['levelTable', 'fractions', 3] → 'fraction of level 4 (v = 3)'. Used wherever a
 * single result number is named on its own (the record comparison before signing, CSV headers).
 */
import { RESULT_QUANTITIES, isGroup, isList, unitOf, type Quantity, type QuantityContext, type QuantityNode } from './quantities'

export type ResultPath = (string | number)[]

export interface FoundQuantity {
  quantity: Quantity
  /** The items the path passes through, outermost first ('mode 1 (stretch)', 'v = 3'). */
  items: string[]
  unit: string | undefined
}

const child = (value: unknown, key: string | number): unknown =>
  value !== null && typeof value === 'object' ? (value as Record<string | number, unknown>)[key] : undefined

const indexOf = (segment: string | number): number | null => {
  const index = typeof segment === 'number' ? segment : /^\d+$/.test(segment) ? Number(segment) : Number.NaN
  return Number.isInteger(index) && index >= 0 ? index : null
}

/** Splits 'levels[1].fraction' into ['levels', 1, 'fraction'] (null when it is not a path). */
export function parseResultPath(text: string): ResultPath | null {
  const path: ResultPath = []
  for (const part of text.split('.')) {
    const match = /^([A-Za-z_$][\w$]*)((?:\[\d+\])*)$/.exec(part)
    if (!match) return null
    path.push(match[1]!)
    for (const index of match[2]!.matchAll(/\[(\d+)\]/g)) path.push(Number(index[1]))
  }
  return path
}

/** The path as a programmer writes it: levels[3].fraction. */
export function pathText(path: ResultPath): string {
  return path.map((segment, index) => (typeof segment === 'number' ? `[${segment}]` : index === 0 ? segment : `.${segment}`)).join('')
}

/** Follows a path through a kind's catalogue; null when the catalogue has no such quantity. */
export function findResultQuantity(kind: string, path: ResultPath, context: QuantityContext): { node: QuantityNode, items: string[] } | null {
  const root = RESULT_QUANTITIES[kind]
  if (!root) return null
  let node: QuantityNode = root
  let value: unknown = context.result
  const items: string[] = []
  let segments = path
  // A level-table column named without its table (['fractions', 3]) is read inside levelTable.
  const table = root.fields.levelTable
  if (kind === 'levels' && typeof path[0] === 'string' && !(path[0] in root.fields) && table && isGroup(table) && path[0] in table.fields) {
    segments = ['levelTable', ...path]
  }
  for (const segment of segments) {
    if (isList(node)) {
      const index = indexOf(segment)
      if (index === null) return null
      items.push(node.item(index, child(value, index), context, value))
      value = child(value, index)
      node = node.each
    } else if (isGroup(node)) {
      const next: QuantityNode | undefined = typeof segment === 'string' && Object.hasOwn(node.fields, segment) ? node.fields[segment] : undefined
      if (!next) return null
      value = child(value, segment)
      node = next
      if (isGroup(node) && node.name) items.push(node.name)
    } else {
      return null
    }
  }
  return { node, items }
}

/** The quantity at a path, with the unit it has in this result; null for unknown paths or non-leaves. */
export function resultQuantityAt(kind: string, path: ResultPath, context: QuantityContext): FoundQuantity | null {
  const found = findResultQuantity(kind, path, context)
  if (!found || isGroup(found.node) || isList(found.node)) return null
  return { quantity: found.node, items: found.items, unit: unitOf(found.node, context) }
}

function phrase(label: string, items: string[]): string {
  return items.length ? `${label} of ${[...items].reverse().join(' of ')}` : label
}

function withUnit(text: string, unit: string | undefined): string {
  return unit ? `${text}, in ${unit}` : text
}

/** Input of a sweep or solve block: the swept kind and its base input. */
function sweptKind(input: unknown, result: unknown): { kind: string, baseInput: unknown } | null {
  const kind = child(result, 'kind') ?? child(input, 'kind')
  return typeof kind === 'string' ? { kind, baseInput: child(input, 'baseInput') } : null
}

/** One output of a swept kind named in words, e.g. 'fraction of level 2' (with its unit). */
function describeOutput(swept: { kind: string, baseInput: unknown }, output: unknown): string {
  const path = typeof output === 'string' ? parseResultPath(output) : null
  return path ? describeResultQuantity(swept.kind, path, swept.baseInput, undefined) : `output ${String(output)}`
}

/**
 * Names the result quantity at a JSON path inside a kind's result in words, with its unit:
 * describeResultQuantity('levels', ['levelTable', 'fractions', 3], input, result) →
 * 'fraction of level 4 (v = 3)'; ['molarEntropy'] → 'molar entropy, in J/(mol·K)'.
 * Input and result, when given, supply labels (a level's name) and units (a table's energy unit).
 * A path the catalogue does not know is still named, by the path itself.
 */
export function describeResultQuantity(kind: string, path: (string | number)[], input?: unknown, result?: unknown): string {
  const context: QuantityContext = { input, result }
  const swept = sweptKind(input, result)
  if (swept && kind === 'sweep' && path[0] === 'series' && path[2] === 'values') {
    const seriesIndex = indexOf(path[1]!)
    const pointIndex = path.length > 3 ? indexOf(path[3]!) : null
    const output = describeOutput(swept, child(child(child(result, 'series'), seriesIndex ?? -1), 'output') ?? child(child(input, 'outputs'), seriesIndex ?? -1))
    if (pointIndex === null) return `${output}, over the temperature grid`
    const temperature = child(child(result, 'temperatures'), pointIndex)
    return `${output}, at grid point ${pointIndex + 1}${typeof temperature === 'number' ? ` (T = ${temperature.toPrecision(6)} K)` : ''}`
  }
  if (swept && kind === 'solveTemperature' && path.length === 1 && (path[0] === 'value' || path[0] === 'target')) {
    const output = describeOutput(swept, child(result, 'output') ?? child(input, 'output'))
    return path[0] === 'value' ? `${output}, at the solved temperature` : `target for ${output}`
  }
  const found = findResultQuantity(kind, path, context)
  if (!found) return `result value ${pathText(path)}`
  if (isGroup(found.node) || isList(found.node)) return found.items.length ? [...found.items].reverse().join(' of ') : `result value ${pathText(path)}`
  return withUnit(phrase(found.node.label, found.items), unitOf(found.node, context))
}
