// Packages that ship no type declarations: declared here as far as this project uses them.
declare module 'pdfmake'
declare module 'pdfmake/js/PDFDocument.js'
declare module 'autocannon'
declare module 'fontkit'

declare module 'archiver' {
  import type { Readable, Transform } from 'node:stream'
  /** archiver's zip writer: append sources, then finalize; read it as a stream. */
  export class ZipArchive extends Transform {
    constructor(options?: { zlib?: { level?: number } })
    append(source: Readable | Buffer | string, data: { name: string, date?: Date, store?: boolean }): this
    finalize(): Promise<void>
    pointer(): number
  }
}

declare module 'yauzl' {
  import type { EventEmitter } from 'node:events'
  import type { Readable } from 'node:stream'
  export interface Entry { fileName: string, uncompressedSize: number }
  export interface ZipFile extends EventEmitter {
    readEntry(): void
    openReadStream(entry: Entry, callback: (error: Error | null, stream?: Readable) => void): void
  }
  export function fromBuffer(buffer: Buffer, options: { lazyEntries?: boolean }, callback: (error: Error | null, zip?: ZipFile) => void): void
}
