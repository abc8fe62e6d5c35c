// The PDF fonts straight from node_modules, for tests and benchmarks that render outside Nitro.
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { readFile } from 'node:fs/promises'
import { ATKINSON_FILES, NOTO_FILES, type PdfFontFiles, type PdfFontLoader } from '../../server/pdf/fonts'

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
