import { describe, expect, it } from 'vitest'
import { evaluate, listKinds } from '../../../shared/thermo'
import { ALLOWED_MARKS, ALLOWED_NODES, randomBlockId } from '../../../shared/editor/nodes'
import { editorDocumentIssues } from '../../../shared/editor/validate'

const block = (attrs: Record<string, unknown> = {}) => ({
  type: 'calculationBlock',
  attrs: { blockId: randomBlockId(), kind: 'levels', title: 'Two levels', collapsed: false, input: { levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 3 }], temperature: '300 K' }, ...attrs },
})
const doc = (...content: unknown[]) => ({ type: 'doc', content })

describe('editorDocumentIssues', () => {
  it('accepts every kind with its example input as a block', () => {
    const content = listKinds().map(kind => block({ kind: kind.kind, title: kind.title, input: kind.exampleInput }))
    expect(editorDocumentIssues(doc(...content))).toEqual([])
  })

  it('accepts the rich text the editor makes', () => {
    const text = { type: 'text', text: 'x', marks: Object.keys(ALLOWED_MARKS).filter(mark => mark !== 'link').map(type => ({ type })) }
    expect(editorDocumentIssues(doc(
      { type: 'heading', attrs: { level: 3 }, content: [text] },
      { type: 'orderedList', attrs: { start: 1, type: null }, content: [{ type: 'listItem', content: [{ type: 'paragraph', content: [text] }] }] },
      { type: 'codeBlock', attrs: { language: null }, content: [{ type: 'text', text: 'q = Σ g e^(-E/kT)' }] },
      { type: 'paragraph', content: [{ type: 'text', text: 'mail', marks: [{ type: 'link', attrs: { href: 'mailto:lab@example.org' } }] }, { type: 'hardBreak' }] },
      { type: 'horizontalRule' },
    ))).toEqual([])
  })

  it('names each disallowed node and mark type by path', () => {
    const issues = editorDocumentIssues(doc(
      { type: 'paragraph', content: [{ type: 'text', text: 'a', marks: [{ type: 'textStyle', attrs: { color: 'red' } }] }] },
      { type: 'image', attrs: { src: 'https://example.org/x.png' } },
    ))
    expect(issues.map(issue => issue.path)).toEqual(['content[0].content[0].marks[0].type', 'content[1].type'])
  })

  it('refuses links to script and data, and unknown attributes', () => {
    for (const href of ['javascript:alert(1)', ' JAVASCRIPT:alert(1)', 'data:text/html,x', '//evil.example/']) {
      const issues = editorDocumentIssues(doc({ type: 'paragraph', content: [{ type: 'text', text: 'a', marks: [{ type: 'link', attrs: { href } }] }] }))
      expect(issues[0]?.path, href).toBe('content[0].content[0].marks[0].attrs.href')
    }
    expect(editorDocumentIssues(doc({ type: 'paragraph', attrs: { style: 'x' } }))[0]?.path).toBe('content[0].attrs.style')
    expect(editorDocumentIssues(doc({ type: 'heading', attrs: { level: 9 } }))[0]?.path).toBe('content[0].attrs.level')
  })

  it('names the block (title and id) and the field the engine refuses, with the engine\'s own words', () => {
    const input = { levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 0 }], temperature: '300 K' }
    const bad = block({ input })
    const [issue] = editorDocumentIssues(doc({ type: 'paragraph' }, bad))
    let engineMessage = ''
    try { evaluate({ kind: 'levels', input }) }
    catch (error) { engineMessage = (error as { issues: { message: string }[] }).issues[0]!.message }
    expect(issue).toMatchObject({ path: 'content[1].attrs.input.levels[1].degeneracy', field: 'input.levels[1].degeneracy', blockId: bad.attrs.blockId, blockTitle: 'Two levels' })
    expect(issue!.message).toContain("calculation block 'Two levels'")
    expect(issue!.message).toContain(engineMessage)
  })

  it('accepts a levels block in its level-table form, as a JSON round trip gives it, and names a bad entry by its index', () => {
    const energies = Array.from({ length: 3000 }, (_, index) => index * 10)
    const levelTable = { energyUnit: 'cm^-1', energies, degeneracies: energies.map((_, index) => 1 + (index % 3)), labels: energies.map((_, index) => `level ${index + 1}`) }
    const table = block({ title: 'Imported ladder', input: { levelTable, temperature: '300 K', amount: '1 mol' } })
    expect(editorDocumentIssues(JSON.parse(JSON.stringify(doc(table))))).toEqual([])
    const bad = block({ title: 'Imported ladder', input: { levelTable: { ...levelTable, energies: energies.map((energy, index) => (index === 12 ? 'abc' : energy)) }, temperature: '300 K' } })
    const [issue] = editorDocumentIssues(doc(bad))
    expect(issue).toMatchObject({ path: 'content[0].attrs.input.levelTable.energies[12]', field: 'input.levelTable.energies[12]', blockTitle: 'Imported ladder' })
    expect(issue!.message).toContain("'abc'")
  })

  it('refuses duplicate block ids, unknown kinds and attributes, and content inside a block', () => {
    const one = block()
    expect(editorDocumentIssues(doc(one, { ...one, attrs: { ...one.attrs, title: 'again' } }))[0]).toMatchObject({ field: 'blockId', blockTitle: 'again' })
    expect(editorDocumentIssues(doc(block({ kind: 'toString' })))[0]?.field).toBe('kind')
    expect(editorDocumentIssues(doc(block({ result: {} })))[0]?.field).toBe('result')
    expect(editorDocumentIssues(doc({ ...block(), content: [{ type: 'text', text: 'x' }] }))[0]?.field).toBe('content')
  })

  it('refuses documents that are not documents, and stops at the issue limit', () => {
    expect(editorDocumentIssues(null)).toHaveLength(1)
    expect(editorDocumentIssues({ type: 'paragraph' })).toHaveLength(1)
    expect(editorDocumentIssues(doc(doc()))[0]?.message).toMatch(/outermost/)
    const many = doc(...Array.from({ length: 50 }, () => ({ type: 'video' })))
    expect(editorDocumentIssues(many, 5)).toHaveLength(5)
  })

  it('limits nesting depth', () => {
    let node: Record<string, unknown> = { type: 'paragraph' }
    for (let depth = 0; depth < 60; depth++) node = { type: 'blockquote', content: [node] }
    expect(editorDocumentIssues(doc(node)).some(issue => /nest/.test(issue.message))).toBe(true)
  })

  it('lists only types the editor registers', () => {
    expect(Object.keys(ALLOWED_NODES)).toContain('calculationBlock')
    expect(Object.keys(ALLOWED_NODES)).not.toContain('image')
  })
})
