// Every wrong input gives an EngineInputError naming the field path (never a TypeError).
import { describe, expect, it } from 'vitest'
import { EngineInputError, evaluate, toJoules, toKelvin } from '../../../shared/thermo/index'

function issuesOf(kind: unknown, input: unknown) {
  try {
    evaluate({ kind, input } as { kind: string; input: unknown })
  } catch (error) {
    expect(error).toBeInstanceOf(EngineInputError)
    return (error as EngineInputError).issues
  }
  throw new Error('expected an EngineInputError')
}

const twoLevels = [{ energy: '0 cm^-1' }, { energy: '100 cm^-1', degeneracy: 3 }]

describe('field-named errors', () => {
  it.each([
    ['unknown kind', 'nonsense', {}, 'kind', /expected one of the kinds/],
    ['missing kind', undefined, {}, 'kind', /expected one of the kinds/],
    ['input not an object', 'levels', 'text', 'input', /object/],
    ['temperature as energy', 'levels', { levels: twoLevels, temperature: '1 eV' }, 'temperature', /expected a temperature such as '298.15 K' or '25 °C', got an energy/],
    ['negative absolute temperature', 'levels', { levels: twoLevels, temperature: '-5 K' }, 'temperature', /above 0 K/],
    ['zero kelvin', 'levels', { levels: twoLevels, temperature: '0 K' }, 'temperature', /above 0 K/],
    ['bare number for temperature', 'levels', { levels: twoLevels, temperature: 300 }, 'temperature', /with its unit/],
    ['number without unit in text', 'levels', { levels: twoLevels, temperature: '300' }, 'temperature', /a unit is required/],
    ['missing temperature', 'levels', { levels: twoLevels }, 'temperature', /required/],
    ['non-integer degeneracy', 'levels', { levels: [{ energy: '0 K' }, { energy: '1 K' }, { energy: '2 K', degeneracy: 1.5 }], temperature: '3 K' }, 'levels[2].degeneracy', /whole number/],
    ['zero degeneracy', 'levels', { levels: [{ energy: '0 K', degeneracy: 0 }], temperature: '3 K' }, 'levels[0].degeneracy', /at least 1/],
    ['empty level list', 'levels', { levels: [], temperature: '3 K' }, 'levels', /empty/],
    ['energy of the wrong kind', 'levels', { levels: [{ energy: '1 bar' }], temperature: '3 K' }, 'levels[0].energy', /expected an energy .* got a pressure/],
    ['unknown unit', 'levels', { levels: [{ energy: '5 furlongs' }], temperature: '3 K' }, 'levels[0].energy', /not a unit/],
    ['typo in a field name', 'levels', { levels: twoLevels, temprature: '3 K', temperature: '3 K' }, 'temprature', /unknown field/],
    ['amount of the wrong kind', 'levels', { levels: twoLevels, temperature: '3 K', amount: '3 K' }, 'amount', /amount of substance/],
    ['level table with a NaN', 'levels', { levelTable: { energyUnit: 'cm^-1', energies: [0, Number.NaN] }, temperature: '3 K' }, 'levelTable.energies[1]', /finite/],
    ['level table with a bad unit', 'levels', { levelTable: { energyUnit: 'bar', energies: [0, 1] }, temperature: '3 K' }, 'levelTable.energyUnit', /energy/],
    ['vibration with zero wavenumber', 'vibration', { modes: [{ wavenumber: '0 cm^-1' }], temperature: '300 K' }, 'modes[0].wavenumber', /above zero/],
    ['vibration with a negative anharmonicity', 'vibration', { modes: [{ wavenumber: '1000 cm^-1', anharmonicity: '-5 cm^-1' }], temperature: '300 K' }, 'modes[0].anharmonicity', /zero or more/],
    ['rotation with a bad symmetry number', 'rotation', { rotationalConstant: '2 cm^-1', symmetryNumber: 0, temperature: '300 K' }, 'symmetryNumber', /symmetry number/],
    ['rotation constant as a temperature in degC', 'rotation', { rotationalConstant: '2 degC', temperature: '300 K' }, 'rotationalConstant', /must be given in K/],
    ['spin without a field', 'spin', { nucleus: '1H', temperature: '300 K' }, 'field', /field/],
    ['spin with an unknown nucleus', 'spin', { nucleus: '2H', field: '9.4 T', temperature: '300 K' }, 'nucleus', /expected one of/],
    ['spin with a field of the wrong kind', 'spin', { nucleus: '1H', field: '9.4 K', temperature: '300 K' }, 'field', /magnetic field/],
    ['spin quantum number not a half-integer', 'spin', { gyromagneticRatio: '1e8 s^-1 T^-1', spinQuantumNumber: 0.3, field: '1 T', temperature: '300 K' }, 'spinQuantumNumber', /multiple of 1\/2/],
    ['microstates with neither form', 'microstates', {}, 'oscillators', /either/],
    ['microstates with negative quanta', 'microstates', { oscillators: { count: 3, quanta: -1 } }, 'oscillators.quanta', /zero or more/],
    ['Boltzmann plot with a zero intensity', 'boltzmannPlot', { lines: [{ upperEnergy: '1 eV', degeneracy: 1, intensity: 1 }, { upperEnergy: '2 eV', degeneracy: 1, intensity: 0 }] }, 'lines[1].intensity', /above zero/],
    ['Boltzmann plot with one energy', 'boltzmannPlot', { lines: [{ upperEnergy: '1 eV', degeneracy: 1, intensity: 1 }, { upperEnergy: '1 eV', degeneracy: 3, intensity: 2 }] }, 'lines', /two different/],
    ['Boltzmann plot with one line', 'boltzmannPlot', { lines: [{ upperEnergy: '1 eV', degeneracy: 1, intensity: 1 }] }, 'lines', /at least two/],
    ['thermochemistry linear without B', 'thermochemistry', { molarMass: '28 g/mol', shape: 'linear', temperature: '300 K' }, 'rotationalConstants', /one rotational constant/],
    ['thermochemistry molar mass as energy', 'thermochemistry', { molarMass: '28 eV', shape: 'atom', temperature: '300 K' }, 'molarMass', /molar mass/],
    ['thermochemistry bad pressure', 'thermochemistry', { molarMass: '28 g/mol', shape: 'atom', temperature: '300 K', pressure: '1 K' }, 'pressure', /pressure/],
    ['sweep of an unknown kind', 'sweep', { kind: 'nope', baseInput: {}, start: '10 K', stop: '20 K', points: 3, outputs: ['x'] }, 'kind', /unknown kind/],
    ['sweep with a bad base input', 'sweep', { kind: 'levels', baseInput: { levels: [{ energy: '1 bar' }] }, start: '10 K', stop: '20 K', points: 3, outputs: ['partitionFunction'] }, 'baseInput.levels[0].energy', /energy/],
    ['sweep with too many points', 'sweep', { kind: 'levels', baseInput: { levels: twoLevels }, start: '10 K', stop: '20 K', points: 5000, outputs: ['partitionFunction'] }, 'points', /2000/],
    ['sweep with an unknown output', 'sweep', { kind: 'levels', baseInput: { levels: twoLevels }, start: '10 K', stop: '20 K', points: 3, outputs: ['levels[7].fraction'] }, 'outputs[0]', /not a number/],
    ['sweep of a kind without temperature', 'sweep', { kind: 'microstates', baseInput: {}, start: '10 K', stop: '20 K', points: 3, outputs: ['x'] }, 'kind', /does not depend on temperature/],
    ['solve with an unreachable target', 'solveTemperature', { kind: 'levels', baseInput: { levels: twoLevels }, output: 'levels[1].fraction', target: 0.9, lower: '10 K', upper: '2000 K' }, 'target', /no temperature between/],
    ['solve with lower above upper', 'solveTemperature', { kind: 'levels', baseInput: { levels: twoLevels }, output: 'levels[1].fraction', target: 0.5, lower: '2000 K', upper: '10 K' }, 'upper', /above the lower/],
  ])('%s', (_name, kind, input, path, message) => {
    const issues = issuesOf(kind, input)
    const issue = issues.find((candidate) => candidate.path === path)
    expect(issue, JSON.stringify(issues)).toBeDefined()
    expect(issue!.message).toMatch(message as RegExp)
  })

  it('the unit helpers name the field they are given', () => {
    expect(() => toKelvin('3 eV', 'modes[0].temperature')).toThrow(/modes\[0\]\.temperature/)
    expect(() => toJoules('3 T', 'levels[4].energy')).toThrow(EngineInputError)
  })

  it('odd request shapes never leak a TypeError', () => {
    for (const request of [null, undefined, 5, 'levels', [], { kind: 'levels' }, { kind: 'levels', input: null }, { kind: 'levels', input: [] }, { kind: 'levels', input: { levels: 'x', temperature: {} } }, { kind: 'levels', input: { levels: [null], temperature: '3 K' } }, { kind: '__proto__', input: {} }, { kind: 'toString', input: {} }]) {
      expect(() => evaluate(request as never)).toThrow(EngineInputError)
    }
  })
})
