// The font files a record PDF embeds: Atkinson Hyperlegible (latin and latin-ext woff, 400 and
// 700, upright and italic) and Noto Sans greek as the fallback for Greek letters. woff, never
// woff2: fontkit crashes on woff2 when pdfkit finalises the document (STACK.md).

export const ATKINSON_FILES = [
  'latin-400-normal', 'latin-700-normal', 'latin-400-italic', 'latin-700-italic',
  'latin-ext-400-normal', 'latin-ext-700-normal', 'latin-ext-400-italic', 'latin-ext-700-italic',
].map(name => `atkinson-hyperlegible-${name}.woff`)

export const NOTO_GREEK_FILES = ['400-normal', '700-normal', '400-italic', '700-italic']
  .map(name => `noto-sans-greek-${name}.woff`)

/** File name → bytes, for every file in ATKINSON_FILES and NOTO_GREEK_FILES. */
export type PdfFontFiles = Record<string, Uint8Array>

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
}
