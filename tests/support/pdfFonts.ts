// The PDF fonts straight from node_modules, for tests and benchmarks that render outside Nitro.
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { ATKINSON_FILES, NOTO_GREEK_FILES, type PdfFontFiles } from '../../server/pdf/fonts'

const root = fileURLToPath(new URL('../..', import.meta.url))

export function pdfFontFilesFromNodeModules(): PdfFontFiles {
  const files: PdfFontFiles = {}
  for (const name of ATKINSON_FILES) files[name] = readFileSync(`${root}/node_modules/@fontsource/atkinson-hyperlegible/files/${name}`)
  for (const name of NOTO_GREEK_FILES) files[name] = readFileSync(`${root}/node_modules/@fontsource/noto-sans/files/${name}`)
  return files
}
