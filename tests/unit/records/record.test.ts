import { describe, expect, it } from 'vitest'
import { buildRecord, recordHash } from '#shared/records'
import type { RecordParts } from '#shared/records'

const entry = {
  id: 'entry-1',
  notebook: { id: 'notebook-1', name: 'Iodine spectra' },
  version: 2,
  supersedes: 1,
  title: 'Rotational populations of I₂ at 300 K',
  content: { type: 'doc', content: [{ type: 'paragraph', content: [{ type: 'text', text: 'Measured.' }] }] },
}
const hash = (digit: string) => digit.repeat(64)

describe('buildRecord', () => {
  it('sorts attachments by name, then sha256, by UTF-16 code units', () => {
    const record = buildRecord({
      entry,
      attachments: [
        { name: 'spectrum.csv', mediaType: 'text/csv', size: 10, sha256: hash('b') },
        { name: 'Z-notes.txt', mediaType: 'text/plain', size: 1, sha256: hash('c') },
        { name: 'spectrum.csv', mediaType: 'text/csv', size: 12, sha256: hash('a') },
        { name: 'ångström.png', mediaType: 'image/png', size: 5, sha256: hash('d') },
      ],
    })
    // Code-unit order puts upper case before lower case and "å" (U+00E5) after ASCII, whatever the locale.
    expect(record.attachments.map((attachment) => `${attachment.name} ${attachment.sha256[0]}`)).toEqual([
      'Z-notes.txt c',
      'spectrum.csv a',
      'spectrum.csv b',
      'ångström.png d',
    ])
  })

  it('keeps calculations in the order given and fills in empty lists', () => {
    const calculations = ['block-9', 'block-1', 'block-5'].map((blockId) => ({
      blockId,
      kind: 'boltzmann-populations',
      input: { temperature: { value: 300, unit: 'K' } },
      result: { levels: [0.5, 0.3, 0.2] },
      engineVersion: '1.0.0',
    }))
    const record = buildRecord({ entry, calculations })
    expect(record.schema).toBe('thermotome.record/1')
    expect(record.calculations.map((calculation) => calculation.blockId)).toEqual(['block-9', 'block-1', 'block-5'])
    expect(record.calculations.every((calculation) => calculation.warnings.length === 0)).toBe(true)
    expect(record.attachments).toEqual([])
  })

  it('gives the same hash whatever order attachments arrive in', async () => {
    const first = { name: 'a.csv', mediaType: 'text/csv', size: 1, sha256: hash('1') }
    const second = { name: 'b.csv', mediaType: 'text/csv', size: 2, sha256: hash('2') }
    const one = buildRecord({ entry, attachments: [first, second] })
    const other = buildRecord({ entry, attachments: [second, first] })
    expect(await recordHash(one)).toBe(await recordHash(other))
  })

  it('names the offending field of invalid parts', () => {
    const bad = { entry: { ...entry, version: 'two' } } as unknown as RecordParts
    expect(() => buildRecord(bad)).toThrow(/^record parts\.entry\.version: expected number, received string$/)
    expect(() => buildRecord({ entry: { ...entry, supersedes: 2 } })).toThrow(/entry\.supersedes: supersedes must name an earlier version/)
    expect(() =>
      buildRecord({ entry, attachments: [{ name: 'x', mediaType: 'text/plain', size: -1, sha256: hash('a') }] }),
    ).toThrow(/attachments\[0\]\.size/)
    expect(() => buildRecord({ entry: { ...entry, content: { value: Number.NaN } } })).toThrow(/entry\.content\.value/)
  })
})
