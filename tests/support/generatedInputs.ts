import fc from 'fast-check'

// Realistic generated inputs for every calculation kind: what a spectroscopist or physical
// chemist types (energies in several units, degeneracies, 1 K to 5000 K, up to hundreds of
// levels). Used by the record-tolerance property tests (unit) and the signing journey in
// Chromium, so that "every entry a scientist can build" is tested on more than one example.
// The values are generated, not reference data.

const round = (value: number, digits = 6) => Number(value.toPrecision(digits))

/** A temperature between 1 K and 5000 K, log-uniform, as typed. */
export const temperatureText = fc.double({ min: 0, max: Math.log10(5000), noNaN: true }).map(exponent => `${round(10 ** exponent, 5)} K`)

/** An energy in one of the units people type, from a value in cm⁻¹. */
const ENERGY_UNITS: { unit: string, perWavenumber: number }[] = [
  { unit: 'cm^-1', perWavenumber: 1 },
  { unit: 'meV', perWavenumber: 0.1239841984 },
  { unit: 'eV', perWavenumber: 1.239841984e-4 },
  { unit: 'kJ/mol', perWavenumber: 0.01196266 },
  { unit: 'kcal/mol', perWavenumber: 0.002859144 },
  { unit: 'K', perWavenumber: 1.438776877 },
  { unit: 'GHz', perWavenumber: 29.9792458 },
  { unit: 'THz', perWavenumber: 0.0299792458 },
]
const energyUnit = fc.constantFrom(...ENERGY_UNITS)
const energyText = (wavenumber: number, unit: { unit: string, perWavenumber: number }) => `${round(wavenumber * unit.perWavenumber)} ${unit.unit}`

const levelsInput = fc.record({
  unit: energyUnit,
  temperature: temperatureText,
  count: fc.integer({ min: 1, max: 300 }),
  spacing: fc.double({ min: 0.5, max: 3000, noNaN: true }),
  jitter: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 300, maxLength: 300 }),
  degeneracies: fc.array(fc.integer({ min: 1, max: 12 }), { minLength: 300, maxLength: 300 }),
  withAmount: fc.boolean(),
}).map(({ unit, temperature, count, spacing, jitter, degeneracies, withAmount }) => {
  let energy = 0
  const levels = Array.from({ length: count }, (_, index) => {
    if (index > 0) energy += spacing * (0.2 + jitter[index]!)
    return { energy: energyText(energy, unit), degeneracy: degeneracies[index]! }
  })
  return { temperature, levels, ...(withAmount ? { amount: '1 mol' } : {}) }
})

const vibrationInput = fc.record({
  temperature: temperatureText,
  modes: fc.array(fc.record({
    wavenumber: fc.double({ min: 50, max: 4000, noNaN: true }),
    anharmonic: fc.boolean(),
    ratio: fc.double({ min: 0.002, max: 0.03, noNaN: true }),
    degeneracy: fc.constantFrom(1, 1, 1, 2, 3),
  }), { minLength: 1, maxLength: 6 }),
  energyZero: fc.constantFrom('groundState', 'wellBottom'),
}).map(({ temperature, modes, energyZero }) => ({
  temperature,
  energyZero,
  modes: modes.map((mode, index) => ({
    label: `mode ${index + 1}`,
    wavenumber: `${round(mode.wavenumber)} cm^-1`,
    ...(mode.degeneracy > 1 ? { degeneracy: mode.degeneracy } : {}),
    ...(mode.anharmonic ? { anharmonicity: `${round(mode.wavenumber * mode.ratio)} cm^-1` } : {}),
  })),
}))

const rotationInput = fc.record({
  temperature: temperatureText,
  constant: fc.double({ min: 0.05, max: 30, noNaN: true }),
  distortion: fc.option(fc.double({ min: 1e-8, max: 1e-3, noNaN: true }), { nil: undefined }),
  homonuclear: fc.boolean(),
}).map(({ temperature, constant, distortion, homonuclear }) => ({
  temperature,
  rotationalConstant: `${round(constant)} cm^-1`,
  symmetryNumber: homonuclear ? 2 : 1,
  ...(distortion !== undefined ? { centrifugalDistortion: `${round(distortion * constant)} cm^-1` } : {}),
}))

const spinInput = fc.record({
  temperature: temperatureText,
  nucleus: fc.constantFrom('1H', '13C', '15N', '19F', '31P'),
  field: fc.double({ min: 0.5, max: 28.2, noNaN: true }),
}).map(({ temperature, nucleus, field }) => ({ temperature, nucleus, field: `${round(field, 4)} T` }))

const microstatesInput = fc.oneof(
  fc.record({ count: fc.integer({ min: 1, max: 12 }), quanta: fc.integer({ min: 0, max: 12 }) }).map(oscillators => ({ oscillators })),
  fc.record({ count: fc.integer({ min: 2, max: 6 }), particles: fc.integer({ min: 1, max: 6 }), steps: fc.integer({ min: 0, max: 8 }) })
    .map(({ count, particles, steps }) => ({ levels: { energies: Array.from({ length: count }, (_, index) => `${index * 100} cm^-1`), particles, totalEnergy: `${steps * 100} cm^-1` } })),
)

const boltzmannPlotInput = fc.record({
  kelvin: fc.double({ min: 300, max: 5000, noNaN: true }),
  lines: fc.array(fc.record({ upper: fc.double({ min: 100, max: 40_000, noNaN: true }), degeneracy: fc.integer({ min: 1, max: 15 }), noise: fc.double({ min: -0.05, max: 0.05, noNaN: true }) }), { minLength: 3, maxLength: 30 }),
}).map(({ kelvin, lines }) => ({
  lines: lines.map((line, index) => ({
    label: `line ${index + 1}`,
    upperEnergy: `${round(line.upper)} cm^-1`,
    degeneracy: line.degeneracy,
    // I ∝ g exp(−E/kT), with a little measurement scatter (c₂ = hc/k = 1.438776877 cm K, CODATA 2018).
    intensity: round(line.degeneracy * Math.exp(-1.438776877 * line.upper / kelvin) * (1 + line.noise) + 1e-300),
  })),
}))

const thermochemistryInput = fc.record({
  temperature: temperatureText,
  shape: fc.constantFrom('atom', 'linear', 'nonlinear'),
  mass: fc.double({ min: 2, max: 300, noNaN: true }),
  constants: fc.array(fc.double({ min: 0.05, max: 30, noNaN: true }), { minLength: 3, maxLength: 3 }),
  sigma: fc.constantFrom(1, 2, 3, 12),
  vibrations: fc.array(fc.double({ min: 100, max: 3800, noNaN: true }), { minLength: 9, maxLength: 9 }),
  pressure: fc.constantFrom('1 bar', '101325 Pa', '1 atm', '10 kPa'),
}).map(({ temperature, shape, mass, constants, sigma, vibrations, pressure }) => {
  const base = { molarMass: `${round(mass)} g/mol`, shape, temperature, pressure }
  if (shape === 'atom') return base
  const modes = shape === 'linear' ? vibrations.slice(0, 4) : vibrations.slice(0, 9)
  return {
    ...base,
    rotationalConstants: (shape === 'linear' ? constants.slice(0, 1) : constants).map(value => `${round(value)} cm^-1`),
    symmetryNumber: shape === 'linear' ? Math.min(sigma, 2) : sigma,
    vibrations: modes.map(wavenumber => ({ wavenumber: `${round(wavenumber)} cm^-1` })),
  }
})

const twoLevelBase = fc.record({ gap: fc.double({ min: 10, max: 3000, noNaN: true }), degeneracy: fc.integer({ min: 1, max: 5 }) })
  .map(({ gap, degeneracy }) => ({ levels: [{ energy: '0 cm^-1' }, { energy: `${round(gap)} cm^-1`, degeneracy }] }))

const sweepInput = fc.record({ base: twoLevelBase, start: fc.double({ min: 1, max: 200, noNaN: true }), span: fc.double({ min: 2, max: 25, noNaN: true }), points: fc.integer({ min: 2, max: 120 }), spacing: fc.constantFrom('linear', 'logarithmic') })
  .map(({ base, start, span, points, spacing }) => ({
    kind: 'levels', baseInput: base, parameter: 'temperature',
    start: `${round(start, 4)} K`, stop: `${round(start * span, 4)} K`, points, spacing, outputs: ['levels[1].fraction', 'partitionFunction'],
  }))

const solveTemperatureInput = fc.record({ base: twoLevelBase, target: fc.double({ min: 0.05, max: 0.3, noNaN: true }) })
  .map(({ base, target }) => ({ kind: 'levels', baseInput: base, output: 'levels[1].fraction', target: round(target, 4), lower: '1 K', upper: '100000 K' }))

/** An arbitrary realistic input for each kind in the registry. */
export const KIND_INPUTS: Record<string, fc.Arbitrary<unknown>> = {
  levels: levelsInput,
  vibration: vibrationInput,
  rotation: rotationInput,
  spin: spinInput,
  microstates: microstatesInput,
  boltzmannPlot: boltzmannPlotInput,
  thermochemistry: thermochemistryInput,
  sweep: sweepInput,
  solveTemperature: solveTemperatureInput,
}

/** `count` inputs of a kind, the same every run for a given seed. */
export function sampleInputs(kind: string, count: number, seed: number): unknown[] {
  const arbitrary = KIND_INPUTS[kind]
  if (!arbitrary) throw new Error(`no generator for the kind '${kind}': add one to tests/support/generatedInputs.ts`)
  return fc.sample(arbitrary, { numRuns: count, seed })
}

/** An editor document with one calculation block per input, as the editor saves it. */
export function documentOf(blocks: { kind: string, input: unknown, title: string }[], seed = 0): Record<string, unknown> {
  return {
    type: 'doc',
    content: [
      { type: 'paragraph', content: [{ type: 'text', text: 'Generated blocks for the record-tolerance check.' }] },
      ...blocks.map((block, index) => ({
        type: 'calculationBlock',
        attrs: { blockId: `00000000-0000-4000-8000-${(seed * 10_000 + index).toString(16).padStart(12, '0')}`, kind: block.kind, title: block.title, input: block.input, collapsed: true },
      })),
    ],
  }
}
