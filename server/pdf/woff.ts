// WOFF 1.0 → plain sfnt (TrueType/OpenType) bytes, once per process. fontkit reads WOFF
// lazily and inflates every table again for each new document; pdfkit makes a new font object
// per document, so handing it the unpacked font saves that work on every record rendered.
// Format: W3C WOFF File Format 1.0, §4 (header), §5 (table directory).
import { inflateSync } from 'node:zlib'

export function woffToSfnt(woff: Uint8Array): Uint8Array {
  const view = new DataView(woff.buffer, woff.byteOffset, woff.byteLength)
  if (view.getUint32(0) !== 0x774F4646) return woff // not 'wOFF': already a plain font
  const flavor = view.getUint32(4)
  const numTables = view.getUint16(12)
  const tables: { tag: number, checksum: number, data: Uint8Array }[] = []
  for (let index = 0; index < numTables; index++) {
    const at = 44 + index * 20
    const tag = view.getUint32(at)
    const offset = view.getUint32(at + 4)
    const compressedLength = view.getUint32(at + 8)
    const originalLength = view.getUint32(at + 12)
    const checksum = view.getUint32(at + 16)
    const raw = woff.subarray(offset, offset + compressedLength)
    const data = compressedLength < originalLength ? new Uint8Array(inflateSync(raw)) : raw
    if (data.length !== originalLength) throw new Error('damaged WOFF table')
    tables.push({ tag, checksum, data })
  }
  const headerLength = 12 + numTables * 16
  const padded = (length: number) => (length + 3) & ~3
  const total = headerLength + tables.reduce((sum, table) => sum + padded(table.data.length), 0)
  const out = new Uint8Array(total)
  const outView = new DataView(out.buffer)
  let entrySelector = 0
  while (2 ** (entrySelector + 1) <= numTables) entrySelector++
  const searchRange = 2 ** entrySelector * 16
  outView.setUint32(0, flavor)
  outView.setUint16(4, numTables)
  outView.setUint16(6, searchRange)
  outView.setUint16(8, entrySelector)
  outView.setUint16(10, numTables * 16 - searchRange)
  let offset = headerLength
  tables.forEach((table, index) => {
    const at = 12 + index * 16
    outView.setUint32(at, table.tag)
    outView.setUint32(at + 4, table.checksum)
    outView.setUint32(at + 8, offset)
    outView.setUint32(at + 12, table.data.length)
    out.set(table.data, offset)
    offset += padded(table.data.length)
  })
  return out
}
