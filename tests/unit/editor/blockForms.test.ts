import { describe, expect, it } from 'vitest'
import { listKinds, registry } from '../../../shared/thermo'
import { BLOCK_FORMS, parsePastedRows, readPath, typedNumber, writePath } from '../../../shared/editor/blockForms'

describe('block forms', () => {
  it('has a form for every engine kind, and every select offers values the engine accepts', () => {
    expect(Object.keys(BLOCK_FORMS).sort()).toEqual(Object.keys(registry).sort())
    for (const kind of listKinds()) {
      for (const field of BLOCK_FORMS[kind.kind]!) {
        if (field.type !== 'select') continue
        for (const option of field.options) {
          const input = writePath(kind.exampleInput as Record<string, unknown>, field.key, option.value)
          const parsed = registry[kind.kind]!.schema.safeParse(input)
          const fieldIssues = parsed.success ? [] : parsed.error.issues.filter(issue => issue.path.join('.') === field.key)
          expect(fieldIssues, `${kind.kind}.${field.key} = ${option.value}`).toEqual([])
        }
      }
    }
  })

  it('reads and writes dotted paths, removing emptied optional parents', () => {
    const input = { oscillators: { count: 3, quanta: 4 } }
    expect(readPath(input, 'oscillators.quanta')).toBe(4)
    const changed = writePath(input, 'oscillators.quanta', 5)
    expect(changed).toEqual({ oscillators: { count: 3, quanta: 5 } })
    expect(input.oscillators.quanta).toBe(4)
    expect(writePath({ nuclearSpinWeights: { even: 1 } }, 'nuclearSpinWeights.even', undefined)).toEqual({})
    expect(writePath({}, 'nuclearSpinWeights.odd', 3)).toEqual({ nuclearSpinWeights: { odd: 3 } })
  })

  it('stores plain numbers as numbers and keeps anything else as typed', () => {
    expect(typedNumber('3')).toBe(3)
    expect(typedNumber(' 2.5e-3 ')).toBeCloseTo(0.0025, 15)
    expect(typedNumber('3.')).toBe(3)
    expect(typedNumber('3 x')).toBe('3 x')
    expect(typedNumber('')).toBeUndefined()
  })

  it('reads spreadsheet rows: tabs between cells, one row a line', () => {
    expect(parsePastedRows('a\t120 cm^-1\t3\r\nb\t350 cm^-1\t5\n')).toEqual([['a', '120 cm^-1', '3'], ['b', '350 cm^-1', '5']])
    expect(parsePastedRows('just one value')).toBeNull()
    expect(parsePastedRows('one\ttwo')).toEqual([['one', 'two']])
  })

  it('thermochemistry asks for the electronic levels, the formula and the nuclear-spin statistics (issue 16)', () => {
    const fields = BLOCK_FORMS.thermochemistry!
    const keys = fields.map(field => field.key)
    for (const key of ['electronicLevels', 'formula', 'nuclearSpin.treatment', 'nuclearSpin.weights.even', 'nuclearSpin.weights.odd', 'nuclearSpin.weights.ee']) expect(keys).toContain(key)
    const electronic = fields.find(field => field.key === 'electronicLevels')!
    expect(electronic.hint).toMatch(/triplet/)
    // The form's fields are paths the engine reads: H2 with normal spin statistics computes.
    let input: Record<string, unknown> = { molarMass: '2.01588 g/mol', shape: 'linear', rotationalConstants: ['59.322 cm-1'], temperature: '77 K' }
    input = writePath(input, 'nuclearSpin.treatment', 'normal')
    input = writePath(input, 'nuclearSpin.weights.even', 1)
    input = writePath(input, 'nuclearSpin.weights.odd', 3)
    input = writePath(input, 'formula', 'H2')
    input = writePath(input, 'electronicLevels', [{ energy: '0 cm⁻¹', degeneracy: 1 }])
    expect(registry.thermochemistry!.schema.safeParse(input).success).toBe(true)
  })
})
