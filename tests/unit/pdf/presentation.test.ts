// The record PDF of a realistic entry with one block of every kind, read back as text with
// poppler's pdftotext (Debian's poppler-utils): it must say what each number is, in words and
// units, and never print the engine's field names.
import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { verifyBundle } from '../../../shared/records'
import { evaluate, listKinds } from '../../../shared/thermo'
import { presentResult } from '../../../shared/present'
import { renderRecordPdfBytes, setupPdfFonts } from '../../../server/pdf/render'
import { pdfFontFilesFromNodeModules, pdfFontLoaderFromNodeModules } from '../../support/pdfFonts'
import { fixtureKey, signedBundle } from '../../support/signedRecords'

const folder = mkdtempSync(join(tmpdir(), 'thermotome-pdf-'))

/** pdftotext output with soft hyphens, zero-width spaces and line breaks inside words removed. */
function pdfText(pdf: Uint8Array, name: string, options: string[] = []): string {
  const file = join(folder, `${name}.pdf`)
  writeFileSync(file, pdf)
  return execFileSync('pdftotext', [...options, file, '-'], { encoding: 'utf8' })
}
const squash = (text: string) => text.replace(/\u200B/g, '').replace(/\s+/g, ' ')

/** camelCase names of every input and result field of a kind (as an auditor would never want to read them). */
function fieldNames(value: unknown, names = new Set<string>()): Set<string> {
  if (value !== null && typeof value === 'object') {
    const list = typeof (value as { length?: unknown }).length === 'number'
    if (list) { if ((value as ArrayLike<unknown>).length) fieldNames((value as ArrayLike<unknown>)[0], names) }
    else for (const [key, inner] of Object.entries(value)) { if (/[a-z][A-Z]/.test(key)) names.add(key); fieldNames(inner, names) }
  }
  return names
}

const vibrationInput = { modes: [{ label: 'symmetric stretch', wavenumber: '3657 cm^-1' }, { label: 'bend', wavenumber: '1595 cm^-1' }, { label: 'antisymmetric stretch', wavenumber: '3756 cm^-1' }], temperature: '1500 K' }

describe('record PDF of an entry with a block of every kind', () => {
  let text = ''
  let blocks: { kind: string, title: string, input: unknown }[] = []
  beforeAll(async () => {
    setupPdfFonts(pdfFontFilesFromNodeModules(), pdfFontLoaderFromNodeModules)
    blocks = listKinds().map(kind => ({ kind: kind.kind, title: `${kind.title} (Kestrel Ridge check)`, input: kind.kind === 'vibration' ? vibrationInput : kind.exampleInput }))
    const made = await signedBundle({
      entryId: '7b2c1d0e-9f8a-4b7c-8d6e-5f4a3b2c1d0e', notebook: { id: 'n1', name: 'Kestrel Ridge — gas cell survey' }, title: 'Populations across the survey',
      author: { id: 'a1', name: 'Dr Amara Lindqvist', email: 'amara@example.test' }, authorKey: await fixtureKey(),
      blocks,
    })
    const pdf = await renderRecordPdfBytes({ bundle: made.bundle, state: 'awaiting_witness', auditEvents: [], verification: await verifyBundle(made.bundle) })
    writeFileSync(join(folder, 'every-kind.pdf'), pdf)
    text = squash(pdfText(pdf, 'every-kind'))
  }, 90_000)

  it('prints the label and the unit of every presented row of every block', () => {
    for (const block of blocks) {
      const { result, warnings } = evaluate({ kind: block.kind, input: block.input })
      const presented = presentResult(block.kind, block.input, result, {}, warnings)
      for (const section of presented.sections) {
        for (const row of section.rows) {
          expect(text, `${block.kind}: ${row.label}`).toContain(squash(row.label))
          if (row.unit) expect(text, `${block.kind}: unit of ${row.label}`).toContain(`${squash(row.label)}`)
        }
      }
      // The model's opening words (its formulas' superscripts print as raised digits).
      expect(text, block.kind).toContain(squash(presented.model).slice(0, 24))
    }
    for (const unit of ['J/(mol·K)', 'J/mol', 'K', 'T', 'Hz', 'Pa']) expect(text).toContain(` ${unit} `)
  })

  it('prints none of the engine’s input or result field names', () => {
    for (const block of blocks) {
      const { result } = evaluate({ kind: block.kind, input: block.input })
      for (const name of fieldNames({ input: block.input, result })) expect(text, `${block.kind}: ${name}`).not.toContain(name)
    }
  })

  it('shows every mode of the vibration block with its own ladder', () => {
    for (const name of ['symmetric stretch', 'bend', 'antisymmetric stretch']) {
      expect(text).toContain(`Vibrational ladder of mode`)
      expect(text).toContain(`(${name})`)
    }
    expect(text.match(/Vibrational ladder of mode \d/g)?.length).toBeGreaterThanOrEqual(3)
  })

  it('prints inputs as typed, beside the SI value used', () => {
    expect(text).toContain('3657 cm^-1')
    expect(text).toContain('1500 K')
    expect(text).toContain('1.9225 cm^-1')
  })
})

describe('record PDF audit table', () => {
  it('keeps 60-character names and 300-character reasons inside the A4 margins (word boxes from pdftotext -bbox)', async () => {
    setupPdfFonts(pdfFontFilesFromNodeModules(), pdfFontLoaderFromNodeModules)
    const made = await signedBundle({
      entryId: '8c3d2e1f-0a9b-4c8d-9e7f-6a5b4c3d2e1f', notebook: { id: 'n1', name: 'Kestrel Ridge — audit layout' }, title: 'Audit layout check',
      author: { id: 'a1', name: 'Dr Amara Lindqvist', email: 'amara@example.test' }, authorKey: await fixtureKey(),
    })
    const longName = 'Maximiliana Evangelina Bartholomäus-Wojciechowska-Featherstone'.slice(0, 60)
    const reason = `${'The witness could not confirm the calibration of the cell pressure gauge against the reference standard. '.repeat(3)}`.slice(0, 300)
    const auditEvents = Array.from({ length: 6 }, (_, index) => ({
      sequence: 1000 + index, occurredAt: '2026-03-02T10:15:30.000Z', action: index % 2 ? 'entry_declined' : 'record_verified_with_a_long_action_code',
      actorEmail: `${'a'.repeat(40)}.${'b'.repeat(20)}@kestrel-ridge-laboratories.example.test`, actorName: longName,
      details: { reason, recordHash: 'f'.repeat(64) },
    }))
    const pdf = await renderRecordPdfBytes({ bundle: made.bundle, state: 'declined', auditEvents, verification: await verifyBundle(made.bundle) })
    const boxes = pdfText(pdf, 'audit-layout', ['-bbox'])
    const right = [...boxes.matchAll(/<word xMin="([\d.]+)" yMin="[\d.]+" xMax="([\d.]+)"/g)].map(match => Number(match[2]))
    const page = /<page width="([\d.]+)"/.exec(boxes)
    expect(right.length).toBeGreaterThan(100)
    // A4 is 595.28 pt wide; the document's margins are 40 pt each side.
    expect(Number(page![1])).toBeCloseTo(595.28, 0)
    expect(Math.max(...right)).toBeLessThanOrEqual(595.28 - 40 + 0.5)
    expect(squash(pdfText(pdf, 'audit-layout-text'))).toContain('Maximiliana')
  }, 60_000)
})
