// Text for the PDF, split into runs a font can draw. Atkinson Hyperlegible ships as two woff
// subsets (latin, latin-ext) that pdfmake cannot merge into one font, and it has neither
// Greek, Cyrillic, CJK nor the Unicode superscript and subscript digits. So every string is
// cut into runs: latin → "Atkinson", latin-ext → "AtkinsonExt", Greek → "NotoGreek" and
// Cyrillic → "NotoCyrillic" (Noto Sans subsets), Japanese and Chinese → one numbered slice of
// Noto Sans JP or SC ("NotoJP119"), superscripts and subscripts → ordinary characters drawn
// with pdfmake's sup/sub. Characters no embedded font covers get a plain-text stand-in, so
// nothing prints as a box.
import japaneseSlices from '@fontsource/noto-sans-jp/unicode.json'
import chineseSlices from '@fontsource/noto-sans-sc/unicode.json'

/** A Noto Sans JP or SC slice: fontsource cuts each into about 100 files of a few hundred characters. */
export type CjkFamily = `NotoJP${number}` | `NotoSC${number}`
export type FontFamily = 'Atkinson' | 'AtkinsonExt' | 'NotoGreek' | 'NotoCyrillic' | CjkFamily

/** One inline run in pdfmake's shape. */
export interface TextRun {
  text: string
  font?: FontFamily
  sup?: boolean
  sub?: boolean
}

type Range = [number, number]

/** Unicode ranges of the @fontsource subsets (their CSS unicode-range), as [first, last]. */
function ranges(spec: string): Range[] {
  return spec.split(',').map((part) => {
    const [first, last] = part.replace(/U\+/g, '').split('-')
    return [Number.parseInt(first!, 16), Number.parseInt(last ?? first!, 16)]
  })
}

const LATIN = ranges('U+0000-00FF,U+0131,U+0152-0153,U+02BB-02BC,U+02C6,U+02DA,U+02DC,U+0304,U+0308,U+0329,U+2000-206F,U+20AC,U+2122,U+2191,U+2193,U+2212,U+2215,U+FEFF,U+FFFD')
const LATIN_EXT = ranges('U+0100-02BA,U+02BD-02C5,U+02C7-02CC,U+02CE-02D7,U+02DD-02FF,U+0304,U+0308,U+0329,U+1D00-1DBF,U+1E00-1E9F,U+1EF2-1EFF,U+2020,U+20A0-20AB,U+20AD-20C0,U+2113,U+2C60-2C7F,U+A720-A7FF')
const GREEK = ranges('U+0370-0377,U+037A-037F,U+0384-038A,U+038C,U+038E-03A1,U+03A3-03FF')
const CYRILLIC = ranges('U+0400-045F,U+0490-0491,U+04B0-04B1,U+2116')

/**
 * Code point → slice number for one CJK font, from fontsource's unicode.json (the CSS
 * unicode-range of every numbered slice), as sorted [first, last, slice] for a binary search.
 */
function sliceTable(slices: Record<string, string>): Int32Array {
  const rows: [number, number, number][] = []
  for (const [key, spec] of Object.entries(slices)) {
    const slice = /^\[(\d+)\]$/.exec(key)?.[1]
    if (slice === undefined) continue // latin, cyrillic, ...: the fonts above cover those
    for (const [first, last] of ranges(spec)) rows.push([first, last, Number(slice)])
  }
  rows.sort((a, b) => a[0] - b[0])
  return Int32Array.from(rows.flat())
}
let cjkTables: { japanese: Int32Array, chinese: Int32Array } | null = null

function sliceOf(table: Int32Array, code: number): number | null {
  let low = 0
  let high = table.length / 3 - 1
  while (low <= high) {
    const middle = (low + high) >> 1
    if (code < table[middle * 3]!) high = middle - 1
    else if (code > table[middle * 3 + 1]!) low = middle + 1
    else return table[middle * 3 + 2]!
  }
  return null
}

/** Kana (hiragana, katakana, their extensions and half-width forms) mark a text as Japanese. */
const KANA = /[\u3040-\u30FF\u31F0-\u31FF\uFF65-\uFF9F]/u

/**
 * The CJK slice for a character. Han characters are shared by Japanese and Chinese but drawn
 * differently: a text with kana is Japanese and takes Noto Sans JP; any other (a name in Han
 * characters alone, the usual Chinese case) takes Noto Sans SC. Each falls back to the other
 * font for a character it lacks (simplified forms are missing from JP, some kanji from SC).
 */
function cjkFamily(code: number, japanese: boolean): CjkFamily | null {
  if (code < 0x2E80) return null
  cjkTables ??= { japanese: sliceTable(japaneseSlices), chinese: sliceTable(chineseSlices) }
  const order = japanese ? (['JP', 'SC'] as const) : (['SC', 'JP'] as const)
  for (const language of order) {
    const slice = sliceOf(language === 'JP' ? cjkTables.japanese : cjkTables.chinese, code)
    if (slice !== null) return `Noto${language}${slice}`
  }
  return null
}

const within = (code: number, list: Range[]) => list.some(([first, last]) => code >= first && code <= last)

export const SUPERSCRIPTS: Record<string, string> = {
  '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9',
  '⁺': '+', '⁻': '\u2212', '⁼': '=', '⁽': '(', '⁾': ')', 'ⁿ': 'n', 'ⁱ': 'i',
}
export const SUBSCRIPTS: Record<string, string> = {
  '₀': '0', '₁': '1', '₂': '2', '₃': '3', '₄': '4', '₅': '5', '₆': '6', '₇': '7', '₈': '8', '₉': '9',
  '₊': '+', '₋': '\u2212', '₌': '=', '₍': '(', '₎': ')', 'ₐ': 'a', 'ₑ': 'e', 'ₒ': 'o', 'ₓ': 'x',
  'ₕ': 'h', 'ₖ': 'k', 'ₗ': 'l', 'ₘ': 'm', 'ₙ': 'n', 'ₚ': 'p', 'ₛ': 's', 'ₜ': 't',
}

/** Plain stand-ins for signs none of the embedded fonts has. */
const STAND_INS: Record<string, string> = {
  '≈': '~', '≃': '~', '∼': '~', '≤': '<=', '≥': '>=', '≠': '!=', '→': '->', '←': '<-', '↔': '<->',
  '⇌': '<=>', '∞': 'infinity', 'ℏ': 'ħ', '√': 'sqrt', '∑': 'sum', '∫': 'integral', '∂': 'd',
  '∝': 'proportional to', '⟨': '<', '⟩': '>', '∆': 'Δ', 'Ω': 'Ω', 'µ': 'μ', 'Å': 'Å', '·': '·', '⋅': '·', '∙': '·',
  '✓': 'yes', '✗': 'no',
}

function fontFor(code: number, japanese: boolean): FontFamily | null {
  if (within(code, LATIN)) return 'Atkinson'
  if (within(code, LATIN_EXT)) return 'AtkinsonExt'
  if (within(code, GREEK)) return 'NotoGreek'
  if (within(code, CYRILLIC)) return 'NotoCyrillic'
  return cjkFamily(code, japanese)
}

type Piece = { text: string, font: FontFamily, shift: 'sup' | 'sub' | null }

function piecesOf(character: string, shift: 'sup' | 'sub' | null, japanese: boolean, depth = 0): Piece[] {
  const code = character.codePointAt(0)!
  const font = fontFor(code, japanese)
  if (font) return [{ text: character, font, shift }]
  const standIn = STAND_INS[character]
  if (standIn !== undefined && depth === 0)
    return Array.from(standIn).flatMap(part => piecesOf(part, shift, japanese, 1))
  // Nothing covers it: name the code point rather than print an empty box.
  return [{ text: `[U+${code.toString(16).toUpperCase().padStart(4, '0')}]`, font: 'Atkinson', shift }]
}

/**
 * Cuts text into runs by font and by raised/lowered position. Returns a plain string when the
 * whole text is latin without superscripts, the common case, so the document stays small.
 */
export function textRuns(text: string): string | TextRun[] {
  const pieces: Piece[] = []
  const normalized = text.normalize('NFC')
  const japanese = KANA.test(normalized)
  for (const character of normalized) {
    if (SUPERSCRIPTS[character] !== undefined) pieces.push(...piecesOf(SUPERSCRIPTS[character]!, 'sup', japanese))
    else if (SUBSCRIPTS[character] !== undefined) pieces.push(...piecesOf(SUBSCRIPTS[character]!, 'sub', japanese))
    else pieces.push(...piecesOf(character, null, japanese))
  }
  const runs: TextRun[] = []
  for (const piece of pieces) {
    const last = runs[runs.length - 1]
    const lastShift = last ? (last.sup ? 'sup' : last.sub ? 'sub' : null) : undefined
    if (last && (last.font ?? 'Atkinson') === piece.font && lastShift === piece.shift) {
      last.text += piece.text
      continue
    }
    const run: TextRun = { text: piece.text }
    if (piece.font !== 'Atkinson') run.font = piece.font
    if (piece.shift === 'sup') run.sup = true
    if (piece.shift === 'sub') run.sub = true
    runs.push(run)
  }
  if (runs.length === 0) return ''
  if (runs.length === 1 && !runs[0]!.font && !runs[0]!.sup && !runs[0]!.sub) return runs[0]!.text
  return runs
}
