import type { RecordBundle } from '#shared/records'
import { pdfBindingProblem, renderBoundPdf } from '../pdf/bound'
import { ATKINSON_FILES, NOTO_FILES, type PdfFontFiles } from '../pdf/fonts'
import { pdfFontsReady, setupPdfFonts } from '../pdf/render'
import type { ExportRecord } from './recordBundle'

let loading: Promise<void> | null = null

/**
 * Reads the font files from Nitro's server assets ('fonts' and 'notoFonts') once; the CJK
 * slices ('cjkFonts') are read when a document first needs one.
 */
async function loadPdfFonts(): Promise<void> {
  if (pdfFontsReady()) return
  loading ??= (async () => {
    const files: PdfFontFiles = {}
    for (const name of ATKINSON_FILES) files[name] = await readFontAsset('assets:fonts', name)
    for (const name of NOTO_FILES) files[name] = await readFontAsset('assets:notoFonts', name)
    setupPdfFonts(files, name => readFontAsset('assets:cjkFonts', name))
  })().catch((error) => { loading = null; throw error })
  await loading
}

async function readFontAsset(base: string, name: string): Promise<Uint8Array> {
  const data = await useStorage(base).getItemRaw(name)
  if (!data) throw new Error(`font ${name} is missing from the server assets (${base})`)
  return data instanceof Uint8Array ? data : new Uint8Array(data as ArrayBuffer)
}

/** The record's PDF, rendered from its bundle alone (server/pdf/bound.ts), checked again with verifyBundle at export. */
export async function renderRecordPdf(record: Pick<ExportRecord, 'bundle'>): Promise<Buffer> {
  await loadPdfFonts()
  return await renderBoundPdf(record.bundle)
}

/** Null when the uploaded PDF is exactly the PDF its bundle renders to, else why not. */
export async function recordPdfBindingProblem(pdf: Uint8Array, bundle: RecordBundle): Promise<string | null> {
  await loadPdfFonts()
  return await pdfBindingProblem(pdf, bundle)
}

/** "thermotome-record-<entry>-v<N>" without an extension. */
export function recordFileStem(record: Pick<ExportRecord, 'entry' | 'version'>): string {
  return `thermotome-record-${record.entry.id}-v${record.version}`
}
