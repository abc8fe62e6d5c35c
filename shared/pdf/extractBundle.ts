// Reads the record bundle a Thermotome PDF carries as an embedded file (PDF 32000-1 §7.11.4:
// an /EmbeddedFile stream, usually /FlateDecode). Pure: the caller passes the inflate
// function (node:zlib on the server and in the CLI), so this file imports nothing.

export type ExtractionProblem = 'not_pdf' | 'no_bundle' | 'unreadable'

export class BundleExtractionError extends Error {
  override name = 'BundleExtractionError'
  constructor(readonly problem: ExtractionProblem, message: string) {
    super(message)
  }
}

export const BUNDLE_SCHEMA_NAME = 'thermotome.bundle/1'

/** Is this the start of a PDF file ("%PDF-" within the first 1024 bytes, as readers allow)? */
export function looksLikePdf(bytes: Uint8Array): boolean {
  const head = latin1(bytes.subarray(0, 1024))
  return head.includes('%PDF-')
}

function latin1(bytes: Uint8Array): string {
  let text = ''
  const chunk = 0x8000
  for (let index = 0; index < bytes.length; index += chunk)
    text += String.fromCharCode(...bytes.subarray(index, index + chunk))
  return text
}

interface EmbeddedStream { dictionary: string, data: Uint8Array }

/** Every /EmbeddedFile stream in the file, by scanning its objects (no xref needed). */
function embeddedStreams(bytes: Uint8Array, text: string): EmbeddedStream[] {
  const found: EmbeddedStream[] = []
  const objectPattern = /\d+\s+\d+\s+obj\s*<</g
  let match: RegExpExecArray | null
  while ((match = objectPattern.exec(text)) !== null) {
    const start = match.index + match[0].length - 2
    const streamAt = text.indexOf('stream', start)
    const objectEnd = text.indexOf('endobj', start)
    if (streamAt === -1 || (objectEnd !== -1 && streamAt > objectEnd)) continue
    const dictionary = text.slice(start, streamAt)
    if (!/\/Type\s*\/EmbeddedFile\b/.test(dictionary)) continue
    let dataStart = streamAt + 'stream'.length
    if (text[dataStart] === '\r') dataStart++
    if (text[dataStart] === '\n') dataStart++
    const length = /\/Length\s+(\d+)(?!\s+\d+\s+R)/.exec(dictionary)
    let dataEnd = length ? dataStart + Number(length[1]) : text.indexOf('endstream', dataStart)
    if (dataEnd < dataStart || dataEnd > bytes.length) dataEnd = text.indexOf('endstream', dataStart)
    if (dataEnd === -1) continue
    found.push({ dictionary, data: bytes.subarray(dataStart, dataEnd) })
    objectPattern.lastIndex = dataEnd
  }
  return found
}

/**
 * The bundle JSON (parsed, not yet verified) embedded in a PDF. Throws BundleExtractionError:
 * 'not_pdf' when the bytes are no PDF, 'no_bundle' when no embedded file is a Thermotome
 * bundle, 'unreadable' when the embedded file cannot be decoded.
 */
export function extractBundleFromPdf(bytes: Uint8Array, inflate: (data: Uint8Array) => Uint8Array): unknown {
  if (!looksLikePdf(bytes)) throw new BundleExtractionError('not_pdf', 'This file is not a PDF.')
  const text = latin1(bytes)
  const streams = embeddedStreams(bytes, text)
  if (streams.length === 0)
    throw new BundleExtractionError('no_bundle', 'This PDF carries no embedded files, so no Thermotome record bundle: it was not exported by Thermotome, or its attachment was removed.')
  let unreadable: string | null = null
  for (const stream of streams) {
    let data = stream.data
    try {
      if (/\/Filter\s*\/FlateDecode\b/.test(stream.dictionary)) data = inflate(data)
      else if (/\/Filter/.test(stream.dictionary)) { unreadable = 'an embedded file uses a compression this check does not read'; continue }
      const parsed = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(data)) as { schema?: unknown }
      if (parsed && typeof parsed === 'object' && parsed.schema === BUNDLE_SCHEMA_NAME) return parsed
    }
    catch (error) {
      unreadable = error instanceof Error ? error.message : String(error)
    }
  }
  if (unreadable !== null)
    throw new BundleExtractionError('unreadable', `The PDF's embedded file could not be read as a record bundle: ${unreadable}`)
  throw new BundleExtractionError('no_bundle', 'None of the files embedded in this PDF is a Thermotome record bundle.')
}

/** Reads a bundle from uploaded bytes: a PDF (its embedded bundle) or JSON. */
export function readBundleBytes(bytes: Uint8Array, inflate: (data: Uint8Array) => Uint8Array): { source: 'pdf' | 'json', bundle: unknown } {
  if (looksLikePdf(bytes)) return { source: 'pdf', bundle: extractBundleFromPdf(bytes, inflate) }
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes).replace(/^\uFEFF/, '')
  }
  catch {
    throw new BundleExtractionError('not_pdf', 'This file is neither a PDF nor a JSON record bundle (it is not UTF-8 text).')
  }
  try {
    return { source: 'json', bundle: JSON.parse(text) }
  }
  catch {
    throw new BundleExtractionError('not_pdf', 'This file is neither a PDF nor a JSON record bundle (it is not valid JSON).')
  }
}
