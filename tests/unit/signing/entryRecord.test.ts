import { describe, expect, it } from 'vitest'
import {
  CalculationBlockError,
  buildEntryRecord,
  calculationsFromContent,
  canonicalJson,
  recheckRecord,
  recordHash,
} from '#shared/records'
import { evaluate, listKinds } from '#shared/thermo'

const block = (blockId: string, kind: string, input: unknown, title = `Block ${blockId}`) =>
  ({ type: 'calculationBlock', attrs: { blockId, kind, title, input, collapsed: false } })
const paragraph = (text: string) => ({ type: 'paragraph', content: [{ type: 'text', text }] })
const twoLevels = { temperature: '300 K', levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 2 }] }

const source = (content: unknown) => ({
  entry: { id: 'entry-1', title: 'Hot-band check', content, version: 2, supersedesVersion: 1 },
  notebook: { id: 'notebook-1', name: 'Infrared line surveys' },
  attachments: [{ name: 'spectrum.csv', mediaType: 'text/csv', size: 120, sha256: 'a'.repeat(64) }],
})

describe('calculationsFromContent', () => {
  it('finds blocks in document order, nested ones included, and evaluates each with the engine', () => {
    const content = {
      type: 'doc',
      content: [
        block('b2', 'levels', twoLevels),
        paragraph('text'),
        { type: 'blockquote', content: [block('b1', 'levels', { ...twoLevels, temperature: '500 K' })] },
      ],
    }
    const calculations = calculationsFromContent(content)
    expect(calculations.map(c => c.blockId)).toEqual(['b2', 'b1'])
    const expected = evaluate({ kind: 'levels', input: twoLevels })
    expect(canonicalJson(calculations[0]!.result)).toBe(canonicalJson(JSON.parse(JSON.stringify(expected.result))))
    expect(calculations[0]!.engineVersion).toBe(expected.engineVersion)
    expect(calculations[0]!.input).toEqual(twoLevels)
  })

  it('gives every kind\'s example input a result that canonical JSON accepts', () => {
    const content = { type: 'doc', content: listKinds().map(kind => block(kind.kind, kind.kind, kind.exampleInput)) }
    const calculations = calculationsFromContent(content)
    expect(calculations).toHaveLength(listKinds().length)
    for (const calculation of calculations) expect(() => canonicalJson(calculation.result)).not.toThrow()
  })

  it('refuses a block that does not compute, naming it by title and id', () => {
    const content = { type: 'doc', content: [block('good', 'levels', twoLevels), block('bad', 'levels', { temperature: '-5 K', levels: [] }, 'Cell temperature')] }
    let caught: unknown
    try { calculationsFromContent(content) }
    catch (error) { caught = error }
    expect(caught).toBeInstanceOf(CalculationBlockError)
    const problems = (caught as CalculationBlockError).problems
    expect(problems).toHaveLength(1)
    expect(problems[0]!.blockId).toBe('bad')
    expect((caught as Error).message).toMatch(/calculation block "Cell temperature" \(bad\)/)
  })

  it('refuses unknown kinds, missing and duplicate block ids', () => {
    const content = { type: 'doc', content: [block('x', 'no-such-kind', {}), block('', 'levels', twoLevels), block('y', 'levels', twoLevels), block('y', 'levels', twoLevels)] }
    try {
      calculationsFromContent(content)
      expect.unreachable()
    }
    catch (error) {
      const messages = (error as CalculationBlockError).problems.map(p => p.message)
      expect(messages[0]).toMatch(/kind/)
      expect(messages[1]).toMatch(/no block id/)
      expect(messages[2]).toMatch(/same id/)
    }
  })

  it('gives an empty list for a document without blocks or without content', () => {
    expect(calculationsFromContent({ type: 'doc', content: [paragraph('only words')] })).toEqual([])
    expect(calculationsFromContent({ type: 'doc' })).toEqual([])
  })
})

describe('buildEntryRecord', () => {
  it('builds the record DESIGN.md describes and the same hash from the same stored data', async () => {
    const content = { type: 'doc', content: [paragraph('Estimate.'), block('b1', 'levels', twoLevels)] }
    const record = buildEntryRecord(source(content))
    expect(record.schema).toBe('thermotome.record/1')
    expect(record.entry).toEqual({ id: 'entry-1', notebook: { id: 'notebook-1', name: 'Infrared line surveys' }, version: 2, supersedes: 1, title: 'Hot-band check', content })
    expect(record.attachments).toHaveLength(1)
    expect(record.calculations).toHaveLength(1)
    // What a browser rebuilds from a JSON round trip of the same data (as jsonb returns it) hashes the same.
    const again = buildEntryRecord(JSON.parse(JSON.stringify(source(content))))
    expect(await recordHash(again)).toBe(await recordHash(record))
  })

  it('changes the hash when the content, title or a block input changes', async () => {
    const content = { type: 'doc', content: [block('b1', 'levels', twoLevels)] }
    const base = await recordHash(buildEntryRecord(source(content)))
    const warmer = { type: 'doc', content: [block('b1', 'levels', { ...twoLevels, temperature: '301 K' })] }
    expect(await recordHash(buildEntryRecord(source(warmer)))).not.toBe(base)
    const retitled = source(content)
    retitled.entry.title = 'Hot-band check (2)'
    expect(await recordHash(buildEntryRecord(retitled))).not.toBe(base)
  })

  it('recheckRecord finds a recorded result that differs from the engine, naming the block and quantity', () => {
    const record = buildEntryRecord(source({ type: 'doc', content: [block('b1', 'levels', twoLevels)] }))
    expect(recheckRecord(record).blocks).toEqual([])
    const altered = structuredClone(record)
    ;(altered.calculations[0]!.result as { partitionFunction?: number }).partitionFunction = 99
    const { blocks } = recheckRecord(altered)
    expect(blocks).toHaveLength(1)
    expect(blocks[0]).toMatchObject({ blockId: 'b1', title: 'Block b1', what: 'value', quantityCount: 1 })
    expect(blocks[0]!.quantities[0]).toMatchObject({ path: ['partitionFunction'], recorded: 99 })
    expect(blocks[0]!.message).toMatch(/“Block b1”: partition function, energies as given: recorded 99, recomputed here 1\.\d+ \(relative difference 9\.\d+e-1\)/)
  })
})

describe('a level table in a record', () => {
  it('is recorded as plain JSON arrays and recomputes to the same canonical JSON', () => {
    const tableInput = { temperature: '300 K', levelTable: { energyUnit: 'cm^-1', energies: [0, 120.5, 480], degeneracies: [1, 3, 5] } }
    const calculations = calculationsFromContent({ type: 'doc', content: [block('t1', 'levels', tableInput)] })
    const result = calculations[0]!.result as { levelTable: { fractions: unknown } }
    expect(Array.isArray(result.levelTable.fractions)).toBe(true)
    expect((result.levelTable.fractions as number[]).reduce((sum, value) => sum + value, 0)).toBeCloseTo(1, 14)
    const record = buildEntryRecord(source({ type: 'doc', content: [block('t1', 'levels', tableInput)] }))
    expect(recheckRecord(record).agrees).toBe(true)
  })
})
