// The font files a record PDF embeds: Atkinson Hyperlegible (latin and latin-ext woff, 400 and
// 700, upright and italic), Noto Sans greek and cyrillic as the fallback for those letters,
// and for Japanese and Chinese the numbered slices of Noto Sans JP and SC (about 100 files of
// some hundred characters each per font and weight), loaded only when a document uses one.
// woff, never woff2: fontkit crashes on woff2 when pdfkit finalises the document (STACK.md).
import type { CjkFamily } from './text'

export const ATKINSON_FILES = [
  'latin-400-normal', 'latin-700-normal', 'latin-400-italic', 'latin-700-italic',
  'latin-ext-400-normal', 'latin-ext-700-normal', 'latin-ext-400-italic', 'latin-ext-700-italic',
].map(name => `atkinson-hyperlegible-${name}.woff`)

export const NOTO_FILES = ['greek', 'cyrillic'].flatMap(subset => ['400-normal', '700-normal', '400-italic', '700-italic']
  .map(name => `noto-sans-${subset}-${name}.woff`))

/** File name → bytes, for every file in ATKINSON_FILES and NOTO_FILES. */
export type PdfFontFiles = Record<string, Uint8Array>

/** Reads one CJK slice file (a name from cjkFontFiles) when a document first needs it. */
export type PdfFontLoader = (fileName: string) => Promise<Uint8Array>

const styles = (prefix: string) => ({
  normal: `${prefix}-400-normal.woff`,
  bold: `${prefix}-700-normal.woff`,
  italics: `${prefix}-400-italic.woff`,
  bolditalics: `${prefix}-700-italic.woff`,
})

/** pdfmake font families; the names are files in pdfmake's virtual file system. */
export const PDF_FONT_FAMILIES = {
  Atkinson: styles('atkinson-hyperlegible-latin'),
  AtkinsonExt: styles('atkinson-hyperlegible-latin-ext'),
  NotoGreek: styles('noto-sans-greek'),
  NotoCyrillic: styles('noto-sans-cyrillic'),
}

/**
 * The pdfmake styles of one CJK slice. The fonts have no italics: italic text keeps the
 * upright letters at the same weight.
 */
export function cjkFontFiles(family: CjkFamily): { normal: string, bold: string, italics: string, bolditalics: string } {
  const [, language, slice] = /^Noto(JP|SC)(\d+)$/.exec(family)!
  const prefix = `noto-sans-${language!.toLowerCase()}-${slice}`
  return { normal: `${prefix}-400-normal.woff`, bold: `${prefix}-700-normal.woff`, italics: `${prefix}-400-normal.woff`, bolditalics: `${prefix}-700-normal.woff` }
}
