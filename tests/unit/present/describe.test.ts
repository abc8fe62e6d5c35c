import { describe, expect, it } from 'vitest'
import { evaluate, listKinds } from '../../../shared/thermo'
import { describeResultQuantity, parseResultPath, resultQuantityAt } from '../../../shared/present'

/** Every leaf path of a result (lists by their first and last item), `units` left out. */
function leafPaths(value: unknown, path: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (value !== null && typeof value === 'object' && typeof (value as { length?: unknown }).length === 'number') {
    const list = value as ArrayLike<unknown>
    for (const index of new Set([0, list.length - 1])) if (index >= 0 && index < list.length) leafPaths(list[index], [...path, index], out)
  } else if (value !== null && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) if (key !== 'units') leafPaths(inner, [...path, key], out)
  } else {
    out.push(path)
  }
  return out
}

describe('describeResultQuantity', () => {
  it('names a level-table fraction by the level and its label, with or without the table in the path', () => {
    const input = { levelTable: { energyUnit: 'cm^-1', energies: [0, 100, 200, 300], labels: ['a', 'b', 'c', 'v = 3'] }, temperature: '300 K' }
    const { result } = evaluate({ kind: 'levels', input })
    expect(describeResultQuantity('levels', ['levelTable', 'fractions', 3], input, result)).toBe('fraction of level 4 (v = 3)')
    expect(describeResultQuantity('levels', ['fractions', 3], input, result)).toBe('fraction of level 4 (v = 3)')
    expect(describeResultQuantity('levels', ['levelTable', 'energies', 1], input, result)).toBe('energy of level 2 (b), in cm⁻¹')
  })

  it('gives the unit with the words', () => {
    expect(describeResultQuantity('levels', ['molarEntropy'])).toBe('molar entropy, in J/(mol·K)')
    expect(describeResultQuantity('vibration', ['modes', 1, 'populations', 2, 'energyJ'], undefined, { modes: [{}, { label: 'bend', populations: [{ v: 0 }, { v: 1 }, { v: 2 }] }] })).toBe('energy above the energy zero of v = 2 of mode 2 (bend), in J')
    expect(describeResultQuantity('thermochemistry', ['contributions', 'vibrational', 'entropy'])).toBe('standard molar entropy of vibration, in J/(mol·K)')
  })

  it('names a sweep value through the swept kind and the grid temperature', () => {
    const input = { kind: 'levels', baseInput: { levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 3 }] }, start: '100 K', stop: '300 K', points: 3, outputs: ['molarEntropy'] }
    const { result } = evaluate({ kind: 'sweep', input })
    expect(describeResultQuantity('sweep', ['series', 0, 'values', 2], input, result)).toBe('molar entropy, in J/(mol·K), at grid point 3 (T = 300.000 K)')
  })

  it('still names a path it does not know, by the path', () => {
    expect(describeResultQuantity('levels', ['noSuchField', 2, 'x'])).toBe('result value noSuchField[2].x')
    expect(describeResultQuantity('noSuchKind', ['a'])).toBe('result value a')
  })

  it('knows every number in the result of every kind’s example input', () => {
    for (const kind of listKinds()) {
      const { result } = evaluate({ kind: kind.kind, input: kind.exampleInput })
      for (const path of leafPaths(result)) {
        if (kind.kind === 'sweep' && path[0] === 'series' && path[2] === 'values') {
          expect(describeResultQuantity(kind.kind, path, kind.exampleInput, result)).not.toMatch(/result value/)
          continue
        }
        const found = resultQuantityAt(kind.kind, path, { input: kind.exampleInput, result })
        expect(found, `${kind.kind} ${JSON.stringify(path)}`).not.toBeNull()
        expect(found!.quantity.label.length).toBeGreaterThan(2)
      }
    }
  })

  it('reads output paths as the sweep writes them', () => {
    expect(parseResultPath('levels[1].fraction')).toEqual(['levels', 1, 'fraction'])
    expect(parseResultPath('modes[0].populations[3].fraction')).toEqual(['modes', 0, 'populations', 3, 'fraction'])
    expect(parseResultPath('1x')).toBeNull()
  })
})
