import { beforeAll, describe, expect, it } from 'vitest'
import { evaluate } from '../../shared/thermo'
import { LEVEL_TABLE_IMPORT_MAX } from '../../shared/editor/levelTable'
import { as, type Client } from '../support/http'

/**
 * PATCH /api/entries/:id checks the whole editor document: allowed node and mark types only,
 * each calculation block's attributes, and its input through the engine (400 naming the block
 * by title and blockId, and the field). Stale lock versions answer 409; entries in notebooks
 * one does not belong to answer 404.
 */
let amara: Client
let entryId: string
let foreignEntryId: string

const BLOCK_ID = '5b0c6f0e-8a3e-4c1e-9b7a-2f1d3c4e5a60'
const block = (attrs: Record<string, unknown> = {}) => ({
  type: 'calculationBlock',
  attrs: {
    blockId: BLOCK_ID, kind: 'levels', title: 'Ladder at 296 K', collapsed: false,
    input: { levels: [{ energy: '0 cm^-1' }, { energy: '2143.3 cm^-1' }], temperature: '296 K' },
    ...attrs,
  },
})
const paragraph = (text: string, marks?: unknown[]) => ({ type: 'paragraph', content: [{ type: 'text', text, ...(marks ? { marks } : {}) }] })
const doc = (...content: unknown[]) => ({ type: 'doc', content })

async function lockVersion(id = entryId) {
  return (await amara.get(`/api/entries/${id}`)).body.entry.lockVersion as number
}
async function save(content: unknown) {
  return amara.patch(`/api/entries/${entryId}`, { lockVersion: await lockVersion(), content })
}

beforeAll(async () => {
  amara = await as('amara')
  const notebooks = (await amara.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
  const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
  entryId = (await amara.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Editor document checks' })).body.entry.id
  // The administrator reads every notebook; Amara is not a member of the NMR one.
  const hana = await as('hana')
  const allNotebooks = (await hana.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
  const nmr = allNotebooks.find(n => n.name.startsWith('Hyperpolarisation'))!
  foreignEntryId = (await hana.get(`/api/notebooks/${nmr.id}/entries`)).body.entries[0].id
})

describe('saving an editor document', () => {
  it('stores rich text with allowed marks, a table and a valid calculation block as given', async () => {
    const content = doc(
      { type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text: 'Conditions' }] },
      paragraph('CO', [{ type: 'bold' }]),
      { type: 'paragraph', content: [{ type: 'text', text: 'H' }, { type: 'text', text: '2', marks: [{ type: 'subscript' }] }, { type: 'text', text: 'see', marks: [{ type: 'link', attrs: { href: 'https://example.org/co', target: '_blank', rel: 'noopener noreferrer nofollow', class: null, title: null } }] }] },
      { type: 'table', content: [{ type: 'tableRow', content: [{ type: 'tableHeader', attrs: { colspan: 1, rowspan: 1, colwidth: null }, content: [paragraph('T')] }] }] },
      block(),
    )
    const reply = await save(content)
    expect(reply.status).toBe(200)
    const stored = (await amara.get(`/api/entries/${entryId}`)).body.entry.content
    expect(stored).toEqual(content)
  })

  it('refuses an unknown node type, naming where it is', async () => {
    const reply = await save(doc(paragraph('fine'), { type: 'iframe', attrs: { src: 'https://example.org' } }))
    expect(reply.status).toBe(400)
    expect(reply.body.message).toContain("'iframe' is not allowed")
    expect(reply.body.data.issues[0].path).toBe('content.content[1].type')
  })

  it('refuses an unknown mark and a script link', async () => {
    const mark = await save(doc(paragraph('x', [{ type: 'highlight' }])))
    expect(mark.status).toBe(400)
    expect(mark.body.data.issues[0].path).toBe('content.content[0].content[0].marks[0].type')
    const link = await save(doc(paragraph('x', [{ type: 'link', attrs: { href: 'javascript:alert(1)' } }])))
    expect(link.status).toBe(400)
    expect(link.body.data.issues[0].path).toBe('content.content[0].content[0].marks[0].attrs.href')
  })

  it('refuses raw HTML smuggled as a node field', async () => {
    const reply = await save(doc({ type: 'paragraph', html: '<img src=x onerror=alert(1)>' }))
    expect(reply.status).toBe(400)
    expect(reply.body.data.issues[0].path).toBe('content.content[0].html')
  })

  it('stores a block whose input the engine refuses as typed (a draft always saves), naming the block and the field', async () => {
    const content = doc(paragraph('before'), block({ input: { levels: [{ energy: '0 cm^-1' }, { energy: '2143.3 apples' }], temperature: '296 K' } }))
    const reply = await save(content)
    expect(reply.status).toBe(200)
    expect((await amara.get(`/api/entries/${entryId}`)).body.entry.content).toEqual(content)
    const issue = reply.body.incompleteBlocks[0]
    expect(issue.message).toContain("calculation block 'Ladder at 296 K'")
    expect(issue.message).toContain(BLOCK_ID)
    expect(issue).toMatchObject({ blockId: BLOCK_ID, blockTitle: 'Ladder at 296 K', field: 'input.levels[1].energy', path: 'content.content[1].attrs.input.levels[1].energy' })
    // The same input through the engine gives the same complaint (one schema on both sides).
    let engineMessage = ''
    try { evaluate({ kind: 'levels', input: { levels: [{ energy: '0 cm^-1' }, { energy: '2143.3 apples' }], temperature: '296 K' } }) }
    catch (error) { engineMessage = (error as { issues: { message: string }[] }).issues[0]!.message }
    expect(engineMessage).not.toBe('')
    expect(issue.message).toContain(engineMessage)
  })

  it('stores a levels block as a level table of the largest import size within the default 1 MB body limit, and names a bad energy by its index', async () => {
    // Invented ladder: four-decimal energies in cm^-1, g = 2J+1, short labels (the import's typical file).
    const energies = Array.from({ length: LEVEL_TABLE_IMPORT_MAX }, (_, index) => Number((2143.3 * Math.floor(index / 400) + 1.9313 * (index % 400) * (index % 400 + 1)).toFixed(4)))
    const levelTable = { energyUnit: 'cm^-1', energies, degeneracies: energies.map((_, index) => 2 * (index % 400) + 1), labels: energies.map((_, index) => `v=${Math.floor(index / 400)} J=${index % 400}`) }
    const content = doc(paragraph('Imported ladder.'), block({ input: { levelTable, temperature: '296 K', amount: '1 mol' } }))
    const body = JSON.stringify({ lockVersion: await lockVersion(), content })
    expect(Buffer.byteLength(body)).toBeLessThan(1024 * 1024)
    const reply = await amara.patch(`/api/entries/${entryId}`, body)
    expect(reply.status).toBe(200)
    const stored = (await amara.get(`/api/entries/${entryId}`)).body.entry.content
    expect(stored.content[1].attrs.input.levelTable).toEqual(levelTable)

    const bad = await save(doc(block({ input: { levelTable: { ...levelTable, energies: energies.map((energy, index) => (index === 12 ? 'abc' : energy)) }, temperature: '296 K' } })))
    expect(bad.status).toBe(200)
    expect(bad.body.incompleteBlocks[0]).toMatchObject({ blockId: BLOCK_ID, field: 'input.levelTable.energies[12]', incomplete: true })
  })

  it('stores a temperature typed without its unit, and names it as not complete', async () => {
    const reply = await save(doc(block({ input: { levels: [{ energy: '0 cm^-1' }], temperature: '296' } })))
    expect(reply.status).toBe(200)
    expect(reply.body.incompleteBlocks[0].field).toBe('input.temperature')
  })

  it('refuses an unknown kind, a bad block id, an unknown attribute and two blocks with one id', async () => {
    const kind = await save(doc(block({ kind: 'alchemy' })))
    expect(kind.status).toBe(400)
    expect(kind.body.data.issues[0].field).toBe('kind')
    const id = await save(doc(block({ blockId: 'not-a-uuid' })))
    expect(id.status).toBe(400)
    expect(id.body.data.issues[0].field).toBe('blockId')
    const extra = await save(doc(block({ result: { temperature: 1 } })))
    expect(extra.status).toBe(400)
    expect(extra.body.data.issues[0].field).toBe('result')
    const twice = await save(doc(block(), block({ title: 'Copy' })))
    expect(twice.status).toBe(400)
    expect(twice.body.message).toContain("calculation block 'Copy'")
    expect(twice.body.data.issues[0].field).toBe('blockId')
  })

  it('refuses a stale lock version with 409 and keeps the stored document', async () => {
    const current = await lockVersion()
    const first = await amara.patch(`/api/entries/${entryId}`, { lockVersion: current, content: doc(paragraph('first writer')) })
    expect(first.status).toBe(200)
    const second = await amara.patch(`/api/entries/${entryId}`, { lockVersion: current, content: doc(paragraph('second writer')) })
    expect(second.status).toBe(409)
    expect(second.body.message).toMatch(/Someone else changed this entry/)
    const stored = (await amara.get(`/api/entries/${entryId}`)).body.entry.content
    expect(stored.content[0].content[0].text).toBe('first writer')
  })

  it("answers 404 for an entry in another person's notebook, even with a bad document", async () => {
    const reply = await amara.patch(`/api/entries/${foreignEntryId}`, { lockVersion: 1, content: doc({ type: 'iframe' }) })
    expect(reply.status).toBe(404)
  })

  it('checks a document given when an entry is created, too', async () => {
    const notebooks = (await amara.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const refused = await amara.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Smuggled node', content: doc({ type: 'script', content: [] }) })
    expect(refused.status).toBe(400)
    expect(refused.body.data.issues[0].path).toBe('content.content[0].type')
    const badBlock = await amara.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Half-typed block', content: doc(block({ input: { levels: [{ energy: '0 cm^-1' }], temperature: 'hot' } })) })
    expect(badBlock.status).toBe(201)
    expect(badBlock.body.incompleteBlocks[0]).toMatchObject({ blockId: BLOCK_ID, field: 'input.temperature' })
    const accepted = await amara.post(`/api/notebooks/${infrared.id}/entries`, { title: 'With a block', content: doc(paragraph('fine'), block()) })
    expect(accepted.status).toBe(201)
    expect(accepted.body.entry.content.content[1].attrs.blockId).toBe(BLOCK_ID)
  })

  it('never answers 500 for strange documents', async () => {
    const strange = [
      { type: 'doc', content: [null, 3, 'text', []] },
      { type: 'doc', content: [{ type: 'paragraph', content: 'not a list' }] },
      { type: 'doc', content: [{ type: 'calculationBlock' }] },
      { type: 'doc', content: [{ type: 'calculationBlock', attrs: { blockId: BLOCK_ID, kind: 'levels', title: 't', input: [] } }] },
      { type: 'doc', content: [{ type: 'calculationBlock', attrs: { blockId: BLOCK_ID, kind: '__proto__', title: 't', input: {} } }] },
      { type: 'doc', content: [{ type: 'text', text: '' }] },
    ]
    for (const content of strange) {
      const reply = await save(content)
      expect(reply.status, JSON.stringify(content)).toBe(400)
    }
  })
})
