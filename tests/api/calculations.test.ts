import { beforeAll, describe, expect, it } from 'vitest'
import { evaluate } from '../../shared/thermo'
import { as, type Client } from '../support/http'

let scientist: Client
beforeAll(async () => { scientist = await as('amara') })

describe('POST /api/calculations', () => {
  it('answers with the same result as the shared engine', async () => {
    const request = { kind: 'levels', input: { temperature: '298.15 K', levels: [{ energy: '0 cm^-1' }, { energy: '207.2 cm^-1', degeneracy: 2 }] } }
    const reply = await scientist.post('/api/calculations', request)
    expect(reply.status).toBe(200)
    const local = evaluate(request)
    expect(reply.body.engineVersion).toBe(local.engineVersion)
    const fractions = reply.body.result.levels.map((l: { fraction: number }) => l.fraction)
    local.result && (local.result as { levels: { fraction: number }[] }).levels.forEach((level, index) => {
      expect(fractions[index]).toBeCloseTo(level.fraction, 12)
    })
  })

  it('answers a level table with plain JSON arrays, one entry per level, in every column', async () => {
    const request = { kind: 'levels', input: { temperature: '300 K', amount: 200, levelTable: { energyUnit: 'cm^-1', energies: [0, 208.5, 1500], degeneracies: [1, 2, 3] } } }
    const reply = await scientist.post('/api/calculations', request)
    expect(reply.status).toBe(200)
    const table = reply.body.result.levelTable
    const local = JSON.parse(JSON.stringify(evaluate(request).result)).levelTable
    for (const column of ['energies', 'degeneracies', 'fractions', 'log10Fractions', 'counts', 'belowOneParticle']) {
      expect(Array.isArray(table[column]), column).toBe(true)
      expect(table[column], column).toEqual(local[column])
    }
    expect(table.belowOneParticle).toEqual([false, false, true])
  })

  it('common practice: an upper level at kT (208.5 cm^-1 at 300 K) holds e^-1/(1+e^-1) ≈ 0.269', async () => {
    // kT/hc at 300 K = 208.5 cm^-1 (from the second radiation constant c2 = 1.438776877 cm K).
    const kT = 300 / 1.438776877
    const reply = await scientist.post('/api/calculations', { kind: 'levels', input: { temperature: '300 K', levels: [{ energy: '0 cm^-1' }, { energy: `${kT} cm^-1` }] } })
    expect(reply.body.result.levels[1].fraction).toBeCloseTo(Math.exp(-1) / (1 + Math.exp(-1)), 9)
  })

  it('names the field path inside the input', async () => {
    const reply = await scientist.post('/api/calculations', { kind: 'levels', input: { temperature: '300 K', levels: [{ energy: '0 cm^-1' }, { energy: '100 cm^-1', degeneracy: 1.5 }] } })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^input\.levels\[1\]\.degeneracy:/)
  })

  it('says when a quantity has the wrong kind', async () => {
    const reply = await scientist.post('/api/calculations', { kind: 'levels', input: { temperature: '1 eV', levels: [{ energy: '0 cm^-1' }] } })
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^input\.temperature: expected a temperature/)
  })

  it('refuses a negative absolute temperature and an empty level list', async () => {
    const cold = await scientist.post('/api/calculations', { kind: 'levels', input: { temperature: '-5 K', levels: [{ energy: '0 cm^-1' }] } })
    expect(cold.status).toBe(400)
    expect(cold.body.message).toMatch(/^input\.temperature:/)
    const empty = await scientist.post('/api/calculations', { kind: 'levels', input: { temperature: '300 K', levels: [] } })
    expect(empty.status).toBe(400)
    expect(empty.body.message).toMatch(/^input\.levels:/)
  })

  it('names the kind when it is unknown, and never answers 500 for junk', async () => {
    const unknown = await scientist.post('/api/calculations', { kind: 'astrology', input: {} })
    expect(unknown.status).toBe(400)
    expect(unknown.body.message).toMatch(/^kind:/)
    const junk: unknown[] = [null, 42, 'text', [], { kind: 'levels' }, { kind: 'levels', input: 'x' }, { kind: 'levels', input: { levels: 'x', temperature: {} } },
      { kind: 'sweep', input: { kind: 'sweep', baseInput: {} } }]
    for (const body of junk) {
      const reply = await scientist.post('/api/calculations', body)
      expect(reply.status, JSON.stringify(body)).toBe(400)
    }
  })

  it('stops enumerating a huge microstate problem and answers through log-gamma instead', async () => {
    const reply = await scientist.post('/api/calculations', { kind: 'microstates', input: { oscillators: { count: 1e9, quanta: 1e9 } } })
    expect(reply.status).toBe(200)
    expect(reply.body.result.enumerationComplete).toBe(false)
    // log10 C(2N-1, N) for N = 1e9 is about 2N log10 2 = 6.0206e8 (Stirling; common practice).
    expect(reply.body.result.log10TotalMicrostates / 6.0206e8).toBeCloseTo(1, 4)
  })

  it('lists every kind with a title and a description for the block picker', async () => {
    const reply = await scientist.get('/api/calculations/kinds')
    const kinds = reply.body.kinds.map((k: { kind: string }) => k.kind)
    expect(kinds).toEqual(expect.arrayContaining(['levels', 'vibration', 'rotation', 'spin', 'microstates', 'boltzmannPlot', 'thermochemistry', 'sweep', 'solveTemperature']))
    for (const kind of reply.body.kinds) {
      expect(kind.title.length).toBeGreaterThan(3)
      expect(kind.description.length).toBeGreaterThan(10)
    }
  })
})
