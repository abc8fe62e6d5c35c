// Names and titles in Japanese, Chinese, Greek, Cyrillic and Polish must print as those
// characters, drawn by an embedded font that has them. Read back with poppler's pdftotext and
// pdffonts (Debian's poppler-utils); the CJK fonts are Noto Sans JP and SC from fontsource.
import { execFileSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import * as fontkit from 'fontkit'
import { beforeAll, describe, expect, it } from 'vitest'
import { verifyBundle } from '../../../shared/records'
import { cjkFamiliesIn, renderRecordPdfBytes, setupPdfFonts } from '../../../server/pdf/render'
import { cjkFontFiles } from '../../../server/pdf/fonts'
import { textRuns, type CjkFamily, type TextRun } from '../../../server/pdf/text'
import { pdfFontFilesFromNodeModules, pdfFontLoaderFromNodeModules } from '../../support/pdfFonts'
import { fixtureKey, signedBundle } from '../../support/signedRecords'

const folder = mkdtempSync(join(tmpdir(), 'thermotome-scripts-'))
const run = (tool: string, pdf: Uint8Array, name: string, options: string[] = []) => {
  const file = join(folder, `${name}.pdf`)
  writeFileSync(file, pdf)
  return execFileSync(tool, [...options, file, ...(tool === 'pdftotext' ? ['-'] : [])], { encoding: 'utf8' })
}
const sha256 = (data: Uint8Array) => createHash('sha256').update(data).digest('hex')

// Demo people of the fictional Kestrel Ridge lab.
const JAPANESE_TITLE = '一酸化炭素の回転スペクトル（296 K）'
const CHINESE_NAME = '张伟东'
const GREEK_NAME = 'Ελένη Παπαδοπούλου'
const CYRILLIC_NAME = 'Мария Иванова'
const POLISH_NAME = 'Łukasz Żółkiewski'

const runsOf = (text: string): TextRun[] => { const runs = textRuns(text); return typeof runs === 'string' ? [{ text: runs }] : runs }

describe('text runs for Japanese and Chinese', () => {
  it('sends a text with kana to Noto Sans JP and Han-only names to Noto Sans SC', () => {
    const japanese = runsOf(JAPANESE_TITLE)
    expect(japanese.map(run => run.text).join('')).toBe(JAPANESE_TITLE)
    expect(japanese.filter(run => /[一-龯の]/.test(run.text)).every(run => run.font?.startsWith('NotoJP'))).toBe(true)
    expect(japanese.find(run => run.text.includes('296'))?.font).toBeUndefined()
    const chinese = runsOf(CHINESE_NAME)
    expect(chinese.every(run => run.font?.startsWith('NotoSC'))).toBe(true)
    expect(runsOf(CYRILLIC_NAME).filter(run => run.text.trim()).every(run => run.font === 'NotoCyrillic')).toBe(true)
  })

  it('only sends each slice characters it has a glyph for (fontkit on the slice files)', async () => {
    const sample = `${JAPANESE_TITLE} ${CHINESE_NAME} 山田花子 李娜 東京`
    for (const run of [...runsOf(sample), ...runsOf('データ解析')]) {
      if (!run.font?.startsWith('Noto') || run.font === 'NotoGreek' || run.font === 'NotoCyrillic') continue
      const font = fontkit.create(Buffer.from(await pdfFontLoaderFromNodeModules(cjkFontFiles(run.font as CjkFamily).normal))) as unknown as { hasGlyphForCodePoint(code: number): boolean }
      for (const character of run.text) expect(font.hasGlyphForCodePoint(character.codePointAt(0)!), `${character} in ${run.font}`).toBe(true)
    }
  })
})

describe('record PDF with names in several scripts', () => {
  let pdf: Buffer
  let input: Parameters<typeof renderRecordPdfBytes>[0]
  beforeAll(async () => {
    setupPdfFonts(pdfFontFilesFromNodeModules(), pdfFontLoaderFromNodeModules)
    const made = await signedBundle({
      entryId: '9c8b7a6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d', notebook: { id: 'n1', name: `Kestrel Ridge — ${CYRILLIC_NAME}` }, title: JAPANESE_TITLE,
      author: { id: 'a1', name: CHINESE_NAME, email: 'zhang@example.test' }, authorKey: await fixtureKey(),
      witness: { id: 'w1', name: GREEK_NAME, email: 'eleni@example.test' }, witnessKey: await fixtureKey(),
    })
    input = {
      bundle: made.bundle, state: 'witnessed', verification: await verifyBundle(made.bundle),
      auditEvents: [{ sequence: 1, occurredAt: '2026-03-02T09:00:00.000Z', action: 'entry_created', actorEmail: 'lukasz@example.test', actorName: POLISH_NAME, details: {} }],
    }
    pdf = await renderRecordPdfBytes(input)
  }, 90_000)

  it('prints the title and names exactly as those characters', () => {
    const text = run('pdftotext', pdf, 'scripts').replace(/\u200B/g, '')
    for (const expected of [JAPANESE_TITLE, CHINESE_NAME, GREEK_NAME, CYRILLIC_NAME, POLISH_NAME]) expect(text).toContain(expected)
    expect(text).not.toContain('[U+')
  })

  it('embeds only the CJK slices the document uses, each as a subset (pdffonts)', () => {
    const fonts = run('pdffonts', pdf, 'scripts-fonts').split('\n').slice(2).filter(Boolean)
    const names = fonts.map(line => line.split(/\s+/)[0]!)
    // Subset fonts carry a six-letter tag: ABCDEF+NotoSansJP-Bold; "emb" and "sub" are both yes.
    const cjk = fonts.filter(line => /NotoSans(JP|SC)/.test(line))
    expect(cjk.some(line => line.includes('NotoSansJP'))).toBe(true)
    expect(cjk.some(line => line.includes('NotoSansSC'))).toBe(true)
    for (const line of fonts) expect(line, line).toMatch(/\syes\s+yes\s+(yes|no)\s/)
    expect(names.every(name => /^[A-Z]{6}\+/.test(name))).toBe(true)
    const families = cjkFamiliesIn({ content: [{ text: textRuns(JAPANESE_TITLE) }, { text: textRuns(CHINESE_NAME) }] })
    expect(families.length).toBeLessThan(12)
    expect(pdf.length).toBeLessThan(400_000)
  })

  it('keeps the PDF/A-3b identification and gives the same bytes again', async () => {
    expect(pdf.toString('latin1')).toMatch(/<pdfaid:part>3<\/pdfaid:part>\s*<pdfaid:conformance>B<\/pdfaid:conformance>/)
    expect(sha256(await renderRecordPdfBytes(input))).toBe(sha256(pdf))
  })
})
