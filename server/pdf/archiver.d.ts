// archiver 8 ships no type declarations; the zip writer the bulk export uses.
declare module 'archiver' {
  import type { Readable, Transform } from 'node:stream'
  export class ZipArchive extends Transform {
    constructor(options?: { zlib?: { level?: number }, store?: boolean })
    append(source: Buffer | Readable | string, data: { name: string, date?: Date, store?: boolean }): this
    finalize(): Promise<void>
    abort(): this
    pointer(): number
  }
}
