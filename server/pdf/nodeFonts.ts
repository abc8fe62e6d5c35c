// The PDF fonts straight from node_modules, for rendering outside Nitro: the command-line
// verifier (which re-renders a PDF to compare its bytes), tests and benchmarks.
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { ATKINSON_FILES, NOTO_GREEK_FILES, type PdfFontFiles } from './fonts'

const root = fileURLToPath(new URL('../..', import.meta.url))

export function pdfFontFilesFromNodeModules(): PdfFontFiles {
  const files: PdfFontFiles = {}
  for (const name of ATKINSON_FILES) files[name] = readFileSync(`${root}/node_modules/@fontsource/atkinson-hyperlegible/files/${name}`)
  for (const name of NOTO_GREEK_FILES) files[name] = readFileSync(`${root}/node_modules/@fontsource/noto-sans/files/${name}`)
  return files
}
