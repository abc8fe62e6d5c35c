import { describe, expect, it } from 'vitest'
import { ATTACHMENT_ACCEPT, attachmentExtension, checkAttachmentContent, formatByteSize, MAX_ATTACHMENT_NAME, sanitiseAttachmentName } from '#shared/files/policy'

const bytes = (text: string) => new TextEncoder().encode(text)

describe('sanitiseAttachmentName', () => {
  it('keeps only the last path part, for either separator and absolute paths', () => {
    expect(sanitiseAttachmentName('../../etc/passwd.csv')).toBe('passwd.csv')
    expect(sanitiseAttachmentName('..\\x.csv')).toBe('x.csv')
    expect(sanitiseAttachmentName('/etc/passwd.csv')).toBe('passwd.csv')
    expect(sanitiseAttachmentName('C:\\Windows\\system.ini.csv')).toBe('system.ini.csv')
    expect(sanitiseAttachmentName('C:levels.csv')).toBe('levels.csv')
  })

  it('falls back to "file" for names that are only dots or empty', () => {
    expect(sanitiseAttachmentName('..')).toBe('file')
    expect(sanitiseAttachmentName('a/..')).toBe('file')
    expect(sanitiseAttachmentName('')).toBe('file')
  })

  it('removes control and direction-override characters but keeps other Unicode', () => {
    expect(sanitiseAttachmentName('spin\u0000 data\u001B.csv')).toBe('spin data.csv')
    expect(sanitiseAttachmentName('report\u202Evsc.exe')).toBe('reportvsc.exe')
    expect(sanitiseAttachmentName('Ørsted-Δν niveaux été 温度.csv')).toBe('Ørsted-Δν niveaux été 温度.csv')
    // NFC: "e" + combining acute becomes one "é".
    expect(sanitiseAttachmentName('e\u0301te\u0301.txt')).toBe('été.txt')
  })

  it('shortens long names to 200 characters, keeping the extension', () => {
    const name = sanitiseAttachmentName(`${'Δ'.repeat(300)}.csv`)
    expect(Array.from(name)).toHaveLength(MAX_ATTACHMENT_NAME)
    expect(name.endsWith('.csv')).toBe(true)
  })
})

describe('attachment types', () => {
  it('allows CSV, TSV, TXT and JSON only, case-insensitively', () => {
    expect(attachmentExtension('a.CSV')).toBe('csv')
    expect(attachmentExtension('a.tsv')).toBe('tsv')
    expect(attachmentExtension('a.png')).toBeUndefined()
    expect(attachmentExtension('a.csv.exe')).toBeUndefined()
    expect(attachmentExtension('csv')).toBeUndefined()
    expect(ATTACHMENT_ACCEPT).toBe('.csv,.tsv,.txt,.json')
  })

  it('records the registered media type for good content', () => {
    expect(checkAttachmentContent('a.csv', bytes('E,g\n0,1\n'))).toMatchObject({ ok: true, mediaType: 'text/csv' })
    expect(checkAttachmentContent('a.tsv', bytes('E\tg\n'))).toMatchObject({ ok: true, mediaType: 'text/tab-separated-values' })
    expect(checkAttachmentContent('a.txt', bytes('notes'))).toMatchObject({ ok: true, mediaType: 'text/plain' })
    expect(checkAttachmentContent('a.json', bytes('\uFEFF{"levels": []}'))).toMatchObject({ ok: true, mediaType: 'application/json' })
  })

  it('refuses binary content behind a text extension', () => {
    const png = new Uint8Array([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13])
    expect(checkAttachmentContent('levels.csv', png)).toMatchObject({ ok: false, reason: expect.stringMatching(/binary/) })
    expect(checkAttachmentContent('levels.csv', new Uint8Array([0x45, 0xFF, 0xFE, 0x2C]))).toMatchObject({ ok: false, reason: expect.stringMatching(/UTF-8/) })
  })

  it('refuses JSON that does not parse and other extensions', () => {
    expect(checkAttachmentContent('a.json', bytes('{"open": '))).toMatchObject({ ok: false, reason: expect.stringMatching(/not valid JSON/) })
    expect(checkAttachmentContent('a.exe', bytes('MZ'))).toMatchObject({ ok: false, reason: expect.stringMatching(/CSV, TSV, TXT or JSON/) })
  })

  it('formats sizes in decimal units', () => {
    expect(formatByteSize(999)).toBe('999 B')
    expect(formatByteSize(1500)).toBe('1.5 kB')
    expect(formatByteSize(20_000_000)).toBe('20 MB')
  })
})
