import { createHash } from 'node:crypto'
import { inflateSync } from 'node:zlib'
import * as fontkit from 'fontkit'
import { beforeAll, describe, expect, it } from 'vitest'
import { canonicalJson, verifyBundle } from '../../../shared/records'
import { BundleExtractionError, extractBundleFromPdf, readBundleBytes } from '../../../shared/pdf/extractBundle'
import { renderRecordPdfBytes, setupPdfFonts } from '../../../server/pdf/render'
import { recordDocumentDefinition } from '../../../server/pdf/document'
import { svgForPdf } from '../../../server/pdf/svg'
import { textRuns } from '../../../server/pdf/text'
import { PDF_FONT_FAMILIES } from '../../../server/pdf/fonts'
import { csvCell } from '../../../server/utils/auditFilters'
import { pdfFontFilesFromNodeModules, pdfFontLoaderFromNodeModules } from '../../support/pdfFonts'
import { fixtureKey, signedBundle, type SignedBundle } from '../../support/signedRecords'

const inflate = (data: Uint8Array) => inflateSync(data)
const sha256 = (data: Uint8Array) => createHash('sha256').update(data).digest('hex')

describe('text runs for the embedded fonts', () => {
  it('draws Unicode superscripts and subscripts as raised or lowered ordinary characters', () => {
    expect(textRuns('cm⁻¹')).toEqual([{ text: 'cm' }, { text: '\u22121', sup: true }])
    expect(textRuns('H₂O')).toEqual([{ text: 'H' }, { text: '2', sub: true }, { text: 'O' }])
  })
  it('sends Greek to Noto Sans and latin-ext letters to the latin-ext subset', () => {
    expect(textRuns('ΔE')).toEqual([{ text: 'Δ', font: 'NotoGreek' }, { text: 'E' }])
    expect(textRuns('Łukasz')).toEqual([{ text: 'Ł', font: 'AtkinsonExt' }, { text: 'ukasz' }])
    expect(textRuns('Søren Ångström')).toBe('Søren Ångström')
  })
  it('gives signs no embedded font has a plain stand-in, and names anything else', () => {
    expect(textRuns('a ≈ b')).toBe('a ~ b')
    expect(textRuns('☃')).toBe('[U+2603]')
  })
  it('only sends each font characters it really has a glyph for (fontkit)', () => {
    const files = pdfFontFilesFromNodeModules()
    const fonts = Object.fromEntries(Object.entries(PDF_FONT_FAMILIES).map(([family, styles]) => [family, fontkit.create(Buffer.from(files[styles.normal]!)) as unknown as { hasGlyphForCodePoint(code: number): boolean }]))
    const sample = 'Thermotome 0123456789 −±×·°µÅåøØéü–—…‘’“” ĄąČčĐđĘęŁłŃńŒœŠšŽžħ ΑΒΓΔΘΛΜΞΠΣΦΨΩαβγδεθλμνξπρστφχψω'
    const runs = textRuns(sample)
    for (const run of typeof runs === 'string' ? [{ text: runs }] : runs) {
      const font = fonts[(run as { font?: string }).font ?? 'Atkinson']!
      for (const character of run.text) {
        if (character === ' ') continue
        expect(font.hasGlyphForCodePoint(character.codePointAt(0)!), `${character} in ${(run as { font?: string }).font ?? 'Atkinson'}`).toBe(true)
      }
    }
  })
})

describe('chart SVG for the PDF', () => {
  it('rewrites superscripts and Greek inside text elements into tspans, leaving the rest alone', () => {
    const svg = '<svg><text x="1" y="2" font-size="10">Energy (cm⁻¹)</text><text x="0" y="0" font-size="10">ΔE = 5</text><line x1="0"/></svg>'
    const out = svgForPdf(svg)
    expect(out).toContain('Energy (cm<tspan dy="-4" font-size="7.5">\u22121</tspan><tspan dy="4">)</tspan></text>')
    expect(out).toContain('<tspan font-family="NotoGreek">Δ</tspan>E = 5')
    expect(out).toContain('<line x1="0"/>')
  })
})

describe('record PDF', () => {
  let made: SignedBundle
  let pdf: Buffer
  beforeAll(async () => {
    setupPdfFonts(pdfFontFilesFromNodeModules(), pdfFontLoaderFromNodeModules)
    made = await signedBundle({
      entryId: '3f0c7d1e-5b6a-4c2d-9e8f-0a1b2c3d4e5f', notebook: { id: 'n1', name: 'Infrared line surveys — cell B' }, title: 'Fixture record',
      author: { id: 'a1', name: 'Dr Amara Lindqvist', email: 'amara@example.test' }, authorKey: await fixtureKey(),
      witness: { id: 'w1', name: 'Priya Natarajan', email: 'priya@example.test' }, witnessKey: await fixtureKey(),
    })
    pdf = await renderRecordPdfBytes({ bundle: made.bundle, state: 'witnessed', auditEvents: [], verification: await verifyBundle(made.bundle) })
  }, 60_000)

  it('gives the same bytes for the same record', async () => {
    const again = await renderRecordPdfBytes({ bundle: made.bundle, state: 'witnessed', auditEvents: [], verification: await verifyBundle(made.bundle) })
    expect(sha256(again)).toBe(sha256(pdf))
    const text = pdf.toString('latin1')
    // Every date in the file is the signing time (the witness's, 11:15:30): none comes from the clock.
    const dates = [...text.matchAll(/\/(?:CreationDate|ModDate) \(D:(\d{14})Z\)/g)].map(match => match[1])
    expect(dates.length).toBeGreaterThanOrEqual(2)
    expect(new Set(dates)).toEqual(new Set(['20260302111530']))
  })

  it('carries the canonical bundle as an embedded file that extracts and verifies', async () => {
    const extracted = extractBundleFromPdf(pdf, inflate)
    expect(canonicalJson(extracted as never)).toBe(canonicalJson(made.bundle as never))
    expect((await verifyBundle(extracted)).ok).toBe(true)
    expect(readBundleBytes(pdf, inflate).source).toBe('pdf')
  })

  it('says plainly what is wrong with a file that is not a record', () => {
    const attempt = (bytes: Uint8Array) => { try { readBundleBytes(bytes, inflate); return null } catch (error) { return error as BundleExtractionError } }
    expect(attempt(new TextEncoder().encode('%PDF-1.7\n1 0 obj << /Type /Catalog >> endobj\n'))?.problem).toBe('no_bundle')
    expect(attempt(new TextEncoder().encode('plain words'))?.problem).toBe('not_pdf')
    expect(attempt(new Uint8Array([0xFF, 0xFE, 0x00, 0xD8]))?.problem).toBe('not_pdf')
    const broken = new TextEncoder().encode('%PDF-1.7\n4 0 obj\n<< /Type /EmbeddedFile /Filter /FlateDecode /Length 5 >>\nstream\nxxxxx\nendstream\nendobj\n')
    expect(attempt(broken)?.problem).toBe('unreadable')
    expect(readBundleBytes(new TextEncoder().encode('{"a":1}'), inflate)).toEqual({ source: 'json', bundle: { a: 1 } })
  })
})

describe('record PDF of a levels block in its level-table form', () => {
  it('prints the inputs and results in short, draws the chart, and carries every level in the bundle', async () => {
    setupPdfFonts(pdfFontFilesFromNodeModules(), pdfFontLoaderFromNodeModules)
    const energies = Array.from({ length: 3000 }, (_, index) => index * 10)
    const levelTable = { energyUnit: 'cm^-1', energies, degeneracies: energies.map((_, index) => 1 + (index % 3)), labels: energies.map((_, index) => `level ${index + 1}`) }
    const made = await signedBundle({
      entryId: '5a1e2b3c-4d5e-4f60-8a7b-9c0d1e2f3a4b', notebook: { id: 'n1', name: 'Infrared line surveys — cell B' }, title: 'Imported ladder',
      author: { id: 'a1', name: 'Dr Amara Lindqvist', email: 'amara@example.test' }, authorKey: await fixtureKey(),
      blocks: [{ kind: 'levels', title: 'Imported ladder at 300 K', input: { levelTable, temperature: '300 K', amount: '1 mol' } }],
    })
    // As stored and exported: the bundle's JSON (result columns written as plain arrays).
    const bundle = JSON.parse(canonicalJson(made.bundle as never))
    const verification = await verifyBundle(bundle)
    expect(verification.ok).toBe(true)
    const definition = JSON.stringify(recordDocumentDefinition({ bundle, state: 'awaiting_witness', auditEvents: [], verification }, canonicalJson(bundle)))
    expect(definition).toContain('3000 levels, energies in cm^-1')
    expect(definition).toContain('Populations by level')
    expect(definition).not.toContain('levelTable')
    expect(definition).toContain('"svg":"<svg')
    const pdf = await renderRecordPdfBytes({ bundle, state: 'awaiting_witness', auditEvents: [], verification })
    const extracted = extractBundleFromPdf(pdf, inflate) as typeof bundle
    expect(extracted.record.calculations[0].input.levelTable.energies).toHaveLength(3000)
    expect((await verifyBundle(extracted)).ok).toBe(true)
  }, 60_000)
})

describe('CSV cells', () => {
  it('quotes separators and quotes (RFC 4180) and defuses formulas (OWASP CSV injection)', () => {
    expect(csvCell('plain')).toBe('plain')
    expect(csvCell('a,b')).toBe('"a,b"')
    expect(csvCell('say "hi"')).toBe('"say ""hi"""')
    expect(csvCell('line\nbreak')).toBe('"line\nbreak"')
    expect(csvCell('=1+1')).toBe("'=1+1")
    expect(csvCell('+1')).toBe("'+1")
    expect(csvCell('-2')).toBe("'-2")
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)")
    expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`)
    expect(csvCell(null)).toBe('')
    expect(csvCell(new Date('2026-01-02T03:04:05.000Z'))).toBe('2026-01-02T03:04:05.000Z')
    expect(csvCell({ a: 1 })).toBe('"{""a"":1}"')
  })
})
