import { describeResultQuantity } from '../present/describe'
import { canonicalJson } from './canonical'
import { calculationBlocksOf, calculationsFromContent, CalculationBlockError } from './entryRecord'
import type { Calculation, RecordDocument } from './schema'

// The record tolerance: how a record computed on one machine is checked on another. The
// server's record is the record; a browser (the author's, the witness's, the records
// officer's) or a later verifier recomputes every block and compares. Content and inputs must
// be identical. Numbers must agree within the tolerance below, because engines on different
// machines (a browser's and Node's) differ in the last binary digits of exp, log and pow, and
// exact comparison would refuse ordinary entries. shared/records/README.md states the rule.

/** The record tolerance. */
export const RECORD_TOLERANCE = {
  /** Two numbers agree when |a − b| ≤ relative × max(|a|, |b|) … */
  relative: 1e-9,
  /**
   * … or when |a − b| ≤ seriesFloor × the largest magnitude of the same quantity in the same
   * block (the same path with list positions ignored: every level's energy, every
   * temperature's fraction). This absolute floor is for values near zero, such as a ground
   * level's 0 J beside excited levels at 10⁻²⁰ J, where a relative test means nothing.
   */
  seriesFloor: 1e-12,
} as const

/** The tolerance in words, as the signing statement and the pages state it. */
export const RECORD_TOLERANCE_WORDS = 'every number within a relative 1 × 10⁻⁹ (values near zero within 1 × 10⁻¹² of the largest value of the same quantity in the block)'

export type ResultPath = (string | number)[]

/** One quantity of one block that does not agree. */
export interface QuantityDifference {
  path: ResultPath
  /** What the record holds (the server's value). */
  recorded: unknown
  /** What this machine computes. */
  recomputed: unknown
  /** |a − b| / max(|a|, |b|) for two numbers; null for a difference in kind, text or shape. */
  relativeDifference: number | null
}

/** How one block of a record differs from the same block recomputed here. */
export interface BlockDifference {
  blockId: string
  /** The block's title as the author wrote it ('' when untitled). */
  title: string
  /** Position among the record's calculation blocks, from 1. */
  position: number
  kind: string
  what: 'value' | 'input' | 'engine' | 'missing' | 'extra' | 'error'
  /** For 'value': the quantities that disagree (at most MAX_QUANTITIES of them). */
  quantities: QuantityDifference[]
  /** How many quantities disagree in all. */
  quantityCount: number
  message: string
}

/** What differs between a record and what this machine makes of the same entry. */
export interface RecordComparison {
  /** True when everything agrees within the record tolerance. */
  agrees: boolean
  /** Parts outside the calculations that differ (title, text and blocks, files, version, notebook). */
  parts: string[]
  blocks: BlockDifference[]
  /** How many calculation blocks were compared. */
  blockCount: number
}

const MAX_QUANTITIES = 5

function pattern(path: ResultPath): string {
  return path.map(step => typeof step === 'number' ? '*' : step).join('.')
}

/** The largest magnitude of each quantity (path with list positions ignored) in a result. */
function seriesScales(value: unknown, path: ResultPath = [], scales = new Map<string, number>()): Map<string, number> {
  if (typeof value === 'number') {
    const key = pattern(path)
    scales.set(key, Math.max(scales.get(key) ?? 0, Math.abs(value)))
  }
  else if (Array.isArray(value)) value.forEach((item, index) => seriesScales(item, [...path, index], scales))
  else if (value !== null && typeof value === 'object')
    for (const [key, item] of Object.entries(value)) seriesScales(item, [...path, key], scales)
  return scales
}

/** Whether two numbers agree within the record tolerance, given the scale of their series. */
export function numbersAgree(recorded: number, recomputed: number, seriesScale = 0): boolean {
  if (recorded === recomputed) return true
  if (!Number.isFinite(recorded) || !Number.isFinite(recomputed)) return false
  const difference = Math.abs(recorded - recomputed)
  return difference <= RECORD_TOLERANCE.relative * Math.max(Math.abs(recorded), Math.abs(recomputed))
    || difference <= RECORD_TOLERANCE.seriesFloor * seriesScale
}

export function relativeDifference(recorded: number, recomputed: number): number {
  const scale = Math.max(Math.abs(recorded), Math.abs(recomputed))
  return scale === 0 ? 0 : Math.abs(recorded - recomputed) / scale
}

/**
 * Every quantity where two results (the recorded one and one recomputed from the same input)
 * disagree: numbers beyond the record tolerance, and any difference in text, kind or shape.
 */
export function compareResults(recorded: unknown, recomputed: unknown): QuantityDifference[] {
  const scales = seriesScales(recorded)
  const differences: QuantityDifference[] = []
  const visit = (left: unknown, right: unknown, path: ResultPath) => {
    if (typeof left === 'number' && typeof right === 'number') {
      if (!numbersAgree(left, right, scales.get(pattern(path)) ?? 0))
        differences.push({ path, recorded: left, recomputed: right, relativeDifference: relativeDifference(left, right) })
      return
    }
    if (Array.isArray(left) && Array.isArray(right)) {
      if (left.length !== right.length) {
        differences.push({ path, recorded: `${left.length} values`, recomputed: `${right.length} values`, relativeDifference: null })
        return
      }
      left.forEach((item, index) => visit(item, right[index], [...path, index]))
      return
    }
    if (left !== null && right !== null && typeof left === 'object' && typeof right === 'object' && !Array.isArray(left) && !Array.isArray(right)) {
      const keys = new Set([...Object.keys(left), ...Object.keys(right)])
      for (const key of [...keys].sort()) {
        const a = (left as Record<string, unknown>)[key]
        const b = (right as Record<string, unknown>)[key]
        if (a === undefined || b === undefined) differences.push({ path: [...path, key], recorded: a ?? 'absent', recomputed: b ?? 'absent', relativeDifference: null })
        else visit(a, b, [...path, key])
      }
      return
    }
    if (left !== right) differences.push({ path, recorded: left, recomputed: right, relativeDifference: null })
  }
  visit(recorded, recomputed, [])
  return differences
}

const NUMBER_TOKEN = /[-+]?(?:\d[\d,]*(?:\.\d+)?|\.\d+)(?:[eE][-+]?\d+)?/g

/**
 * Warnings are words with rounded numbers in them: the same words, and each number equal or
 * one unit apart in its last printed digit (a last-bit difference can round either way).
 */
export function warningsAgree(recorded: readonly string[], recomputed: readonly string[]): boolean {
  if (recorded.length !== recomputed.length) return false
  return recorded.every((text, index) => {
    const other = recomputed[index]!
    if (text === other) return true
    if (text.replace(NUMBER_TOKEN, '#') !== other.replace(NUMBER_TOKEN, '#')) return false
    const left = text.match(NUMBER_TOKEN) ?? []
    const right = other.match(NUMBER_TOKEN) ?? []
    return left.every((token, position) => {
      const a = Number(token.replace(/,/g, ''))
      const b = Number(right[position]!.replace(/,/g, ''))
      const decimals = /\.(\d+)/.exec(token.replace(/[eE].*$/, ''))?.[1]?.length ?? 0
      const exponent = Number(/[eE]([-+]?\d+)/.exec(token)?.[1] ?? 0)
      return Math.abs(a - b) <= 1.000001 * 10 ** (exponent - decimals)
    })
  })
}

/** A result path in words: ['levels', 3, 'fraction'] → 'levels › 4 › fraction' (list positions from 1). */
export function pathWords(path: ResultPath): string {
  return path.length === 0 ? 'the result' : path.map(step => typeof step === 'number' ? String(step + 1) : step).join(' › ')
}

/** Names a quantity of a kind's result in words (with its unit): shared/present owns the words. */
export type DescribeQuantity = (kind: string, path: ResultPath, input?: unknown, result?: unknown) => string
const defaultDescribe: DescribeQuantity = (kind, path, input, result) =>
  path[0] === 'warnings' ? 'the warnings' : describeResultQuantity(kind, path, input, result)

function show(value: unknown): string {
  if (typeof value === 'number') return String(value)
  if (typeof value === 'string') return value
  return JSON.stringify(value)
}

function titleOf(block: Pick<BlockDifference, 'title' | 'position'>): string {
  return block.title ? `“${block.title}”` : `calculation block ${block.position}`
}

/** One quantity's difference in words: the quantity, both values and the relative difference. */
export function describeQuantityDifference(kind: string, difference: QuantityDifference, describe: DescribeQuantity = defaultDescribe, input?: unknown, result?: unknown): string {
  const both = `recorded ${show(difference.recorded)}, recomputed here ${show(difference.recomputed)}`
  const relative = difference.relativeDifference === null ? '' : ` (relative difference ${difference.relativeDifference.toExponential(2)})`
  return `${describe(kind, difference.path, input, result)}: ${both}${relative}`
}

function compareCalculation(recorded: Calculation, again: Calculation, title: string, position: number, describe: DescribeQuantity): BlockDifference | null {
  const base = { blockId: recorded.blockId, title, position, kind: recorded.kind }
  const name = titleOf({ title, position })
  if (recorded.kind !== again.kind || canonicalJson(recorded.input) !== canonicalJson(again.input))
    return { ...base, what: 'input', quantities: [], quantityCount: 0, message: `${name}: its input differs from the one recorded` }
  if (recorded.engineVersion !== again.engineVersion) {
    return {
      ...base, what: 'engine', quantities: [], quantityCount: 0,
      message: `${name}: recorded with engine ${recorded.engineVersion}, this page runs ${again.engineVersion}, so it was not compared`,
    }
  }
  const quantities = compareResults(recorded.result, again.result)
  const warningsDiffer = !warningsAgree(recorded.warnings ?? [], again.warnings ?? [])
  if (quantities.length === 0 && !warningsDiffer) return null
  if (warningsDiffer && quantities.length === 0)
    quantities.push({ path: ['warnings'], recorded: (recorded.warnings ?? []).join(' | '), recomputed: (again.warnings ?? []).join(' | '), relativeDifference: null })
  const shown = quantities.slice(0, MAX_QUANTITIES)
  const more = quantities.length > shown.length ? `; and ${quantities.length - shown.length} more` : ''
  return {
    ...base, what: 'value', quantities: shown, quantityCount: quantities.length,
    message: `${name}: ${shown.map(q => describeQuantityDifference(recorded.kind, q, describe, recorded.input, recorded.result)).join('; ')}${more}`,
  }
}

/** Titles of the calculation blocks of an editor document, by block id. */
function blockTitles(content: unknown): Map<string, string> {
  return new Map(calculationBlocksOf(content).map(block => [String(block.blockId), typeof block.title === 'string' ? block.title : '']))
}

/**
 * Compares a record's calculations with the same entry recomputed here. `recomputed` is the
 * result of calculationsFromContent on this machine (or the error it threw).
 */
function compareCalculations(record: RecordDocument, recomputed: Calculation[] | Error, describe: DescribeQuantity): BlockDifference[] {
  const titles = blockTitles(record.entry.content)
  if (recomputed instanceof Error) {
    const problems = recomputed instanceof CalculationBlockError ? recomputed.problems : [{ blockId: null, title: '', position: 0, message: recomputed.message }]
    return problems.map(problem => ({
      blockId: problem.blockId ?? '', title: problem.title, position: problem.position, kind: '', what: 'error' as const,
      quantities: [], quantityCount: 0,
      message: `${titleOf({ title: problem.title, position: problem.position })} does not compute here: ${problem.message}`,
    }))
  }
  const differences: BlockDifference[] = []
  record.calculations.forEach((calculation, index) => {
    const title = titles.get(calculation.blockId) ?? ''
    const again = recomputed.find(candidate => candidate.blockId === calculation.blockId)
    if (!again) {
      differences.push({ blockId: calculation.blockId, title, position: index + 1, kind: calculation.kind, what: 'missing', quantities: [], quantityCount: 0, message: `${titleOf({ title, position: index + 1 })} is in the record but not in the entry's text` })
      return
    }
    const difference = compareCalculation(calculation, again, title, index + 1, describe)
    if (difference) differences.push(difference)
  })
  recomputed.forEach((again, index) => {
    if (!record.calculations.some(calculation => calculation.blockId === again.blockId)) {
      const title = titles.get(again.blockId) ?? ''
      differences.push({ blockId: again.blockId, title, position: index + 1, kind: again.kind, what: 'extra', quantities: [], quantityCount: 0, message: `${titleOf({ title, position: index + 1 })} is in the entry's text but not in the record` })
    }
  })
  return differences
}

function recomputeFrom(content: unknown): Calculation[] | Error {
  try {
    return calculationsFromContent(content)
  }
  catch (error) {
    return error instanceof Error ? error : new Error(String(error))
  }
}

/**
 * Recomputes every block of a record from its own content with this machine's engine and
 * compares with the recorded calculations within the record tolerance. What the witness's and
 * the records officer's pages and every verifier use.
 */
export function recheckRecord(record: RecordDocument, describe: DescribeQuantity = defaultDescribe): RecordComparison {
  const blocks = compareCalculations(record, recomputeFrom(record.entry.content), describe)
  return { agrees: blocks.length === 0, parts: [], blocks, blockCount: record.calculations.length }
}

/**
 * Compares the record the server offers for signing with the record this page makes of the
 * entry it shows: everything but the calculation results identical, the results within the
 * record tolerance. What the author's signing dialog uses.
 */
export function compareOfferedRecord(offered: RecordDocument, shown: RecordDocument, describe: DescribeQuantity = defaultDescribe): RecordComparison {
  const parts: string[] = []
  if (shown.entry.title !== offered.entry.title) parts.push('the title')
  if (canonicalJson(shown.entry.content) !== canonicalJson(offered.entry.content)) parts.push('the text and blocks')
  if (canonicalJson(shown.attachments) !== canonicalJson(offered.attachments)) parts.push('the attached files')
  if (shown.entry.version !== offered.entry.version || shown.entry.supersedes !== offered.entry.supersedes) parts.push('the version number')
  if (canonicalJson(shown.entry.notebook) !== canonicalJson(offered.entry.notebook)) parts.push('the notebook')
  if (shown.entry.id !== offered.entry.id) parts.push('the entry')
  const blocks = compareCalculations(offered, shown.calculations, describe)
  return { agrees: parts.length === 0 && blocks.length === 0, parts, blocks, blockCount: offered.calculations.length }
}

/** Who reads a comparison: the words differ by role, the comparison does not. */
export type RecheckAudience = 'author' | 'witness' | 'records officer' | 'reader'

export interface RecheckSummary {
  agrees: boolean
  headline: string
  /** One line per part or block that differs. */
  lines: string[]
  /** What this person should do about it. */
  advice: string
}

/** The one wording of a comparison, for the signing dialog, the witness's and the records officer's views. */
export function recheckSummary(comparison: RecordComparison, audience: RecheckAudience): RecheckSummary {
  const count = comparison.blockCount
  const blocks = `${count} calculation ${count === 1 ? 'block' : 'blocks'}`
  const lines = [
    ...comparison.parts.map(part => `${part.charAt(0).toUpperCase()}${part.slice(1)} differs from the record the server offered.`),
    ...comparison.blocks.map(block => block.message),
  ]
  if (comparison.agrees) {
    const headline = count === 0
      ? 'The record has no calculation blocks.'
      : `All ${blocks} recomputed in this browser agree with the record within the record tolerance.`
    return { agrees: true, headline, lines: [], advice: '' }
  }
  switch (audience) {
    case 'author':
      return {
        agrees: false,
        headline: 'Not signed: the record the server offered differs from what this page computes, beyond the record tolerance.',
        lines,
        advice: 'Nothing was signed. Reload the entry and try again; if the difference stays, do not sign, and tell your records officer what this says.',
      }
    case 'witness':
      return {
        agrees: false,
        headline: 'What this browser recomputes differs from the signed record beyond the record tolerance.',
        lines,
        advice: 'Do not countersign until you know why. Decline with the reason, or countersign only after saying you have read this difference.',
      }
    case 'records officer':
      return {
        agrees: false,
        headline: 'What this browser recomputes differs from the signed record beyond the record tolerance.',
        lines,
        advice: 'The signed record stands as signed; note this difference in your verification and ask the author why.',
      }
    case 'reader':
      return {
        agrees: false,
        headline: 'What this browser recomputes differs from the signed record beyond the record tolerance.',
        lines,
        advice: 'The signed record is what was signed; the numbers shown are the record\'s.',
      }
  }
}
