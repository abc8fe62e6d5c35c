/**
 * The editor document contract shared by the browser editor and the server check: which
 * node and mark types an entry may hold, which attributes each may carry, and the
 * calculation-block node. Entries hold editor JSON only; nothing here is ever HTML.
 */

/** The name of the calculation-block node in entry content. */
export const CALCULATION_BLOCK = 'calculationBlock'

/** Most calculation blocks one entry may hold (each is recomputed on save and on signing). */
export const MAX_CALCULATION_BLOCKS = 200

/** Attributes of a calculation block (the contract between engineers, see the briefing). */
export interface CalculationBlockAttrs {
  /** A UUID that stays with the block across edits, duplication gives a new one. */
  blockId: string
  /** An engine kind, e.g. 'levels'. */
  kind: string
  /** The block's title as the author named it. */
  title: string
  /** The engine input as typed (quantities as text with units). */
  input: Record<string, unknown>
  /** Whether the block is folded to its title in the editor. */
  collapsed: boolean
}

type AttrCheck = (value: unknown) => string | null

const isInteger = (low: number, high: number): AttrCheck => value =>
  typeof value === 'number' && Number.isInteger(value) && value >= low && value <= high ? null : `expected a whole number from ${low} to ${high}`
const isText = (max: number): AttrCheck => value =>
  value === null || (typeof value === 'string' && value.length <= max) ? null : `expected a text of at most ${max} characters`
const isNullable = (check: AttrCheck): AttrCheck => value => (value === null || value === undefined ? null : check(value))
const isColumnWidths: AttrCheck = value =>
  value === null || (Array.isArray(value) && value.length <= 100 && value.every(width => typeof width === 'number' && width >= 0 && width < 10000))
    ? null : 'expected a list of column widths'

/** Links may point to the web, mail or a place in the app; never to script. */
export const SAFE_LINK = /^(https?:\/\/|mailto:|\/(?!\/)|#)/i

const cellAttrs = { colspan: isInteger(1, 100), rowspan: isInteger(1, 100), colwidth: isColumnWidths }

/** Node types an entry may hold, with the attributes each may carry and how to check them. */
export const ALLOWED_NODES: Record<string, Record<string, AttrCheck>> = {
  doc: {},
  paragraph: { textAlign: isNullable(isText(10)) },
  text: {},
  heading: { level: isInteger(1, 6), textAlign: isNullable(isText(10)) },
  bulletList: {},
  orderedList: { start: isInteger(-1_000_000, 1_000_000), type: isNullable(isText(10)) },
  listItem: {},
  blockquote: {},
  codeBlock: { language: isNullable(isText(40)) },
  horizontalRule: {},
  hardBreak: {},
  table: {},
  tableRow: {},
  tableCell: cellAttrs,
  tableHeader: cellAttrs,
  [CALCULATION_BLOCK]: {},
}

/** Mark types an entry may hold, with their attributes. */
export const ALLOWED_MARKS: Record<string, Record<string, AttrCheck>> = {
  bold: {},
  italic: {},
  strike: {},
  code: {},
  underline: {},
  subscript: {},
  superscript: {},
  link: {
    href: value => typeof value === 'string' && value.length <= 2000 && SAFE_LINK.test(value.trim()) ? null : 'expected a link starting with https://, http://, mailto:, / or #',
    target: isNullable(isText(20)),
    rel: isNullable(isText(100)),
    class: isNullable(isText(100)),
    title: isNullable(isText(200)),
  },
}

/** A new block's attributes for a kind, with a fresh id. */
export function newCalculationBlock(kind: string, title: string, input: unknown, blockId: string): CalculationBlockAttrs {
  return { blockId, kind, title, input: structuredClone(input) as Record<string, unknown>, collapsed: false }
}

/** A version-4 UUID from crypto.getRandomValues (randomUUID needs a secure context; this does not). */
export function randomBlockId(): string {
  const bytes = new Uint8Array(16)
  globalThis.crypto.getRandomValues(bytes)
  bytes[6] = (bytes[6]! & 0x0f) | 0x40
  bytes[8] = (bytes[8]! & 0x3f) | 0x80
  const hex = Array.from(bytes, byte => byte.toString(16).padStart(2, '0')).join('')
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
}
