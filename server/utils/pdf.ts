import { verifyBundle } from '#shared/records'
import { ed25519Verify } from './ed25519'
import { ATKINSON_FILES, NOTO_FILES, type PdfFontFiles } from '../pdf/fonts'
import { pdfFontsReady, renderRecordPdfBytes, setupPdfFonts } from '../pdf/render'
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

/** The record's PDF (same record, same bytes), checked again with verifyBundle at export. */
export async function renderRecordPdf(record: ExportRecord): Promise<Buffer> {
  await loadPdfFonts()
  const verification = await verifyBundle(record.bundle, { verifyEd25519: ed25519Verify })
  return await renderRecordPdfBytes({ bundle: record.bundle, state: record.state, auditEvents: record.auditEvents, verification })
}

/** "thermotome-record-<entry>-v<N>" without an extension. */
export function recordFileStem(record: Pick<ExportRecord, 'entry' | 'version'>): string {
  return `thermotome-record-${record.entry.id}-v${record.version}`
}
