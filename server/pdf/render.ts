// Renders a record PDF with pdfmake 0.3 (Promise API). Fonts come from the caller (Nitro
// server assets in the app, node_modules in tests and benchmarks); pdfmake never fetches a URL
// or reads a local file: both access policies deny everything.
import { createRequire } from 'node:module'
import pdfmake from 'pdfmake'
import pdfmakeDocumentModule from 'pdfmake/js/PDFDocument.js'
import { canonicalJson } from '../../shared/records'
import { ATKINSON_FILES, cjkFontFiles, NOTO_FILES, PDF_FONT_FAMILIES, type PdfFontFiles, type PdfFontLoader } from './fonts'
import { recordDocumentDefinition, type RecordPdfInput } from './document'
import type { CjkFamily } from './text'
import { woffToSfnt } from './woff'

/** Virtual file name → unpacked font bytes, for every font loaded so far. */
let fontBytes: Map<string, Buffer> | null = null
let loadFontFile: PdfFontLoader | null = null
let parseOnce: ((buffer: Buffer) => void) | null = null
const fontFamilies: Record<string, Record<string, string>> = { ...PDF_FONT_FAMILIES }
const cjkLoading = new Map<CjkFamily, Promise<void>>()

const grid = {
  hLineWidth: () => 0.5,
  vLineWidth: () => 0.5,
  hLineColor: () => '#cfc7b3',
  vLineColor: () => '#cfc7b3',
  paddingLeft: () => 4,
  paddingRight: () => 4,
  paddingTop: () => 2,
  paddingBottom: () => 2,
}
const shaded = {
  hLineWidth: () => 0,
  vLineWidth: () => 0,
  fillColor: () => '#f3eee2',
  paddingLeft: () => 8,
  paddingRight: () => 8,
  paddingTop: () => 6,
  paddingBottom: () => 6,
}

/**
 * Loads the font files into pdfmake once per process. The chart SVGs ask pdfkit for a font by
 * the same virtual file name pdfmake's text uses; pdfkit would read such a name from disk, so
 * every new document registers the names with their bytes first (registerFont), and text and
 * charts share one embedded font per style.
 */
export function setupPdfFonts(files: PdfFontFiles, loader: PdfFontLoader): void {
  if (fontBytes) return
  const bytes = new Map<string, Buffer>()
  for (const name of [...ATKINSON_FILES, ...NOTO_FILES]) {
    const data = files[name]
    if (!data) throw new Error(`the PDF font ${name} is missing`)
    const buffer = Buffer.from(woffToSfnt(data))
    bytes.set(name, buffer)
    pdfmake.virtualfs.writeFileSync(name, buffer)
  }
  parseOnce = parseEachFontOnce(new Set(bytes.values()))
  loadFontFile = loader
  pdfmake.setFonts(fontFamilies)
  pdfmake.setUrlAccessPolicy(() => false)
  pdfmake.setLocalAccessPolicy(() => false)
  pdfmake.addTableLayouts({ recordGrid: grid, recordShaded: shaded })
  // A CommonJS module with `exports.default`: Node's ESM import and Nitro's bundle unwrap it differently.
  const moduleValue = pdfmakeDocumentModule as unknown as { default?: { prototype: Record<string, any> }, prototype?: Record<string, any> }
  const prototype = (moduleValue.prototype ? moduleValue : moduleValue.default)!.prototype!
  const initFonts = prototype.initFonts as (this: any, ...args: unknown[]) => void
  prototype.initFonts = function (this: any, ...args: unknown[]) {
    initFonts.apply(this, args)
    for (const [name, buffer] of bytes) this.registerFont(name, buffer)
  }
  fontBytes = bytes
}

export const pdfFontsReady = () => fontBytes !== null

/**
 * pdfkit parses a font's tables again for every document (fontkit.create), about a third of a
 * record PDF's render time. Our fonts never change, so each is parsed once and the parsed font
 * is handed to every document; each document still makes its own subset, so the bytes are the
 * same (the unit tests render one record twice and compare). fontkit's create cannot be
 * replaced (a fixed getter), so this works through its public registerFormat: for our buffers
 * only, the TrueType format declines and a registered "format" answers with the parsed font.
 * It acts on the fontkit instance pdfkit itself loads (CommonJS, resolved from pdfkit's folder).
 */
interface FontFormat { probe(buffer: Uint8Array): boolean }
function parseEachFontOnce(ours: Set<Buffer>): (buffer: Buffer) => void {
  const fromHere = createRequire(import.meta.url)
  const fontkit = createRequire(fromHere.resolve('pdfkit'))('fontkit') as {
    create: (buffer: Uint8Array) => object
    registerFormat: (format: unknown) => void
  }
  const parsed = new Map<Uint8Array, object>()
  for (const buffer of ours) parsed.set(buffer, fontkit.create(buffer))
  const trueType = parsed.values().next().value!.constructor as unknown as FontFormat
  const probe = trueType.probe.bind(trueType)
  trueType.probe = (buffer: Uint8Array) => !ours.has(buffer as Buffer) && probe(buffer)
  let asked: Uint8Array | null = null
  function ParsedFont(): object {
    const font = parsed.get(asked!)!
    asked = null
    return font
  }
  ParsedFont.probe = (buffer: Uint8Array) => {
    if (!ours.has(buffer as Buffer)) return false
    asked = buffer
    return true
  }
  fontkit.registerFormat(ParsedFont)
  return (buffer: Buffer) => {
    parsed.set(buffer, fontkit.create(buffer)) // parsed before it is marked ours
    ours.add(buffer)
  }
}

/** Loads a CJK slice (both weights) into pdfmake the first time a document uses it. */
function loadCjkFamily(family: CjkFamily): Promise<void> {
  let loading = cjkLoading.get(family)
  if (!loading) {
    loading = (async () => {
      const files = cjkFontFiles(family)
      for (const name of new Set(Object.values(files))) {
        if (fontBytes!.has(name)) continue
        const buffer = Buffer.from(woffToSfnt(await loadFontFile!(name)))
        pdfmake.virtualfs.writeFileSync(name, buffer)
        parseOnce!(buffer)
        fontBytes!.set(name, buffer)
      }
      fontFamilies[family] = files
    })().catch((error) => { cjkLoading.delete(family); throw error })
    cjkLoading.set(family, loading)
  }
  return loading
}

/** The CJK slices a document definition names, in its text runs and its chart SVG. */
export function cjkFamiliesIn(definition: unknown): CjkFamily[] {
  const found = new Set<CjkFamily>()
  const visit = (value: unknown): void => {
    if (typeof value === 'string') {
      if (value.startsWith('<svg')) for (const match of value.matchAll(/font-family="(Noto(?:JP|SC)\d+)"/g)) found.add(match[1] as CjkFamily)
      return
    }
    if (Array.isArray(value)) { value.forEach(visit); return }
    if (value && typeof value === 'object') {
      for (const [key, inner] of Object.entries(value)) {
        if (key === 'font' && typeof inner === 'string' && /^Noto(?:JP|SC)\d+$/.test(inner)) found.add(inner as CjkFamily)
        else if (key !== 'files') visit(inner)
      }
    }
  }
  visit(definition)
  return [...found].sort()
}

/**
 * The record's PDF bytes. The attached bundle is its canonical JSON, so the bytes inside the
 * PDF hash the same wherever they are extracted.
 */
export async function renderRecordPdfBytes(input: RecordPdfInput): Promise<Buffer> {
  if (!fontBytes) throw new Error('setupPdfFonts must run before a PDF is rendered')
  const bundleJson = canonicalJson(input.bundle as never)
  const definition = recordDocumentDefinition(input, bundleJson)
  await Promise.all(cjkFamiliesIn(definition).map(loadCjkFamily))
  const document = pdfmake.createPdf(definition)
  return await document.getBuffer()
}
