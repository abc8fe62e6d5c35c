// The PDF fonts straight from node_modules, for rendering outside Nitro: the command-line
// verifier (which re-renders a PDF to compare its bytes), tests and benchmarks.
import { readFileSync } from 'node:fs'
import { readFile } from 'node:fs/promises'
import { fileURLToPath } from 'node:url'
import { ATKINSON_FILES, NOTO_FILES, type PdfFontFiles, type PdfFontLoader } from './fonts'

const root = fileURLToPath(new URL('../..', import.meta.url))

export function pdfFontFilesFromNodeModules(): PdfFontFiles {
  const files: PdfFontFiles = {}
  for (const name of ATKINSON_FILES) files[name] = readFileSync(`${root}/node_modules/@fontsource/atkinson-hyperlegible/files/${name}`)
  for (const name of NOTO_FILES) files[name] = readFileSync(`${root}/node_modules/@fontsource/noto-sans/files/${name}`)
  return files
}

/** The CJK slices, read when a document first needs one (as the server reads its assets). */
export const pdfFontLoaderFromNodeModules: PdfFontLoader = async (name) => {
  const language = /^noto-sans-(jp|sc)-/.exec(name)?.[1]
  if (!language) throw new Error(`not a CJK font file: ${name}`)
  return await readFile(`${root}/node_modules/@fontsource/noto-sans-${language}/files/${name}`)
}
