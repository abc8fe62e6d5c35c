/**
 * Which data files an entry may carry, and how their names are shown. Pure: used by the upload
 * route on the server and by the attachment panel in the browser (accept list, early checks).
 */

/** 20 MB (decimal megabytes, as the limit is stated to people). */
export const MAX_ATTACHMENT_BYTES = 20 * 1000 * 1000

/** Longest display name kept, in characters (code points). */
export const MAX_ATTACHMENT_NAME = 200

/** Allowed extensions and the media type recorded for each (IANA registrations). */
export const ATTACHMENT_TYPES = {
  csv: 'text/csv', // RFC 4180
  tsv: 'text/tab-separated-values',
  txt: 'text/plain',
  json: 'application/json', // RFC 8259
} as const

export type AttachmentExtension = keyof typeof ATTACHMENT_TYPES
export type AttachmentMediaType = (typeof ATTACHMENT_TYPES)[AttachmentExtension]

/** For an `<input type="file" accept>` attribute. */
export const ATTACHMENT_ACCEPT = Object.keys(ATTACHMENT_TYPES).map(extension => `.${extension}`).join(',')

// C0 and C1 controls, DEL, and the bidirectional overrides and isolates that can make
// "report‮vsc.exe" read as "reportexe.csv".
// eslint-disable-next-line no-control-regex
const UNSAFE_CHARACTERS = /[\u0000-\u001F\u007F-\u009F\u200E\u200F\u202A-\u202E\u2066-\u2069]/g

/**
 * The name shown for an uploaded file: the last path part only (both / and \ separate, so
 * "../../etc/passwd.csv" and "..\\x.csv" keep just their final part), without control or
 * direction-override characters, NFC-normalised, Unicode kept, at most 200 characters (the
 * extension is kept when the stem is shortened). Never used as a storage key.
 */
export function sanitiseAttachmentName(raw: string): string {
  const lastPart = raw.split(/[\\/]/).pop() ?? ''
  let name = lastPart.replace(UNSAFE_CHARACTERS, '').normalize('NFC').trim()
  // A bare "." or ".." (or only dots) says nothing; a Windows drive prefix ("C:x.csv") neither.
  name = name.replace(/^[A-Za-z]:(?=.)/, '')
  if (/^\.*$/.test(name))
    name = 'file'
  const characters = Array.from(name)
  if (characters.length > MAX_ATTACHMENT_NAME) {
    const dot = name.lastIndexOf('.')
    const extension = dot > 0 ? Array.from(name.slice(dot)) : []
    const keep = extension.length < 20 ? extension : []
    name = characters.slice(0, MAX_ATTACHMENT_NAME - keep.length).join('') + keep.join('')
  }
  return name
}

/** The allowed extension of a (sanitised) name, lower-cased, or undefined. */
export function attachmentExtension(name: string): AttachmentExtension | undefined {
  const match = /\.([A-Za-z0-9]+)$/.exec(name)
  const extension = match?.[1]?.toLowerCase()
  return extension && extension in ATTACHMENT_TYPES ? extension as AttachmentExtension : undefined
}

export type ContentCheck =
  | { ok: true, mediaType: AttachmentMediaType, text: string }
  | { ok: false, reason: string }

/**
 * Checks that the bytes are what the name says: UTF-8 text without NUL bytes, and for .json a
 * document that parses (RFC 8259). The extension alone is not trusted.
 */
export function checkAttachmentContent(name: string, bytes: Uint8Array): ContentCheck {
  const extension = attachmentExtension(name)
  if (!extension)
    return { ok: false, reason: `"${name}" is not a CSV, TSV, TXT or JSON file: only those data files can be attached.` }
  if (bytes.includes(0))
    return { ok: false, reason: `"${name}" contains binary data (NUL bytes): only plain-text data files can be attached.` }
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes)
  }
  catch {
    return { ok: false, reason: `"${name}" is not valid UTF-8 text: save it as UTF-8 and upload it again.` }
  }
  if (extension === 'json') {
    try {
      JSON.parse(text.replace(/^\uFEFF/, ''))
    }
    catch (error) {
      return { ok: false, reason: `"${name}" is not valid JSON (${(error as Error).message}).` }
    }
  }
  return { ok: true, mediaType: ATTACHMENT_TYPES[extension], text }
}

/** "1.2 MB" style size for people (decimal units, like the 20 MB limit). */
export function formatByteSize(bytes: number): string {
  if (bytes < 1000)
    return `${bytes} B`
  const units = ['kB', 'MB', 'GB']
  let value = bytes / 1000
  let unit = 0
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000
    unit++
  }
  return `${value < 10 ? value.toFixed(1) : Math.round(value)} ${units[unit]}`
}
