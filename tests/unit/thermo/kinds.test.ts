// Behaviour of each kind, the registry and sweep/solveTemperature.
import { describe, expect, it } from 'vitest'
import { BOLTZMANN_CONSTANT, ENGINE_VERSION, GAS_CONSTANT, PLANCK_CONSTANT, SECOND_RADIATION_CONSTANT, SPEED_OF_LIGHT, evaluate, listKinds, registry } from '../../../shared/thermo/index'

// Second radiation constant in cm K, so x = c2 ν̃ / T for ν̃ in cm^-1.
const C2 = SECOND_RADIATION_CONSTANT * 100

describe('registry and listKinds', () => {
  it('lists all eight kinds with titles, descriptions and valid example inputs', () => {
    const kinds = listKinds()
    expect(kinds.map((kind) => kind.kind).sort()).toEqual(['boltzmannPlot', 'levels', 'microstates', 'rotation', 'solveTemperature', 'spin', 'sweep', 'thermochemistry', 'vibration'].sort())
    for (const kind of kinds) {
      expect(kind.title.length).toBeGreaterThan(3)
      expect(kind.description).toMatch(/\.$/)
      expect(registry[kind.kind]!.version).toBe(kind.version)
      const evaluation = evaluate({ kind: kind.kind, input: kind.exampleInput })
      expect(evaluation.engineVersion).toBe(`${ENGINE_VERSION}/${kind.kind}@${kind.version}`)
      // Results must survive JSON unchanged (they go into signed records).
      expect(JSON.parse(JSON.stringify(evaluation.result))).toEqual(evaluation.result)
    }
  })
})

describe('levels', () => {
  it('gives the same populations from text rows and from a level table', () => {
    const rows = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 cm^-1' }, { energy: '150 cm^-1', degeneracy: 3 }, { energy: '400 cm^-1', degeneracy: 5 }], temperature: '300 K', amount: 1000 } }).result
    const table = evaluate({ kind: 'levels', input: { levelTable: { energyUnit: 'cm^-1', energies: [0, 150, 400], degeneracies: [1, 3, 5] }, temperature: '300 K', amount: 1000 } }).result
    rows.levels.forEach((level: { fraction: number; count: number }, index: number) => {
      expect(table.levelTable.fractions[index]).toBeCloseTo(level.fraction, 14)
      expect(table.levelTable.counts[index]).toBeCloseTo(level.count, 10)
    })
    expect(table.molarEntropy).toBeCloseTo(rows.molarEntropy, 10)
  })
  it('flags counts below one particle and reports far-underflowing levels by log10', () => {
    const evaluation = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 eV' }, { energy: '5 eV' }, { energy: '100 eV' }], temperature: '300 K', amount: '1 mol' } })
    const [, middle, top] = evaluation.result.levels
    expect(middle.belowOneParticle).toBe(true)
    expect(top.fraction).toBe(0)
    // log10 p = -E/(kT ln 10) for a level far above a single ground level (McQuarrie ch. 2).
    expect(top.log10Fraction).toBeCloseTo(-(100 * 1.602176634e-19) / (BOLTZMANN_CONSTANT * 300 * Math.LN10), 6)
    expect(evaluation.warnings.join(' ')).toMatch(/fewer than one particle/)
    expect(evaluation.warnings.join(' ')).toMatch(/log10Fraction/)
  })
  it('gives the two-level heat capacity (Schottky anomaly peak 0.439 R at kT ≈ 0.417 Δ)', () => {
    // Peak of C/R = x² e^x/(1+e^x)² is 0.4392 at x = Δ/kT = 2.3994 (Kittel & Kroemer, Thermal Physics).
    const result = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 K' }, { energy: '2.3994 K' }], temperature: '1 K' } }).result
    expect(result.molarHeatCapacity / GAS_CONSTANT).toBeCloseTo(0.4392, 4)
  })
  it('accepts every documented energy form', () => {
    for (const energy of ['2143.3 cm^-1', '2143.3 /cm', '0.36 eV', '12 kJ/mol', '400 MHz', '300 K', '1e-20 J', '3 kcal/mol']) {
      expect(() => evaluate({ kind: 'levels', input: { levels: [{ energy: '0 J' }, { energy }], temperature: '25 degC' } })).not.toThrow()
    }
  })
})

describe('vibration', () => {
  it('harmonic closed form matches an explicit sum', () => {
    const harmonic = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '500 cm^-1' }], temperature: '800 K', maxQuantum: 200 } }).result.modes[0]
    const x = (500 * C2) / 800
    let sum = 0
    for (let v = 0; v < 2000; v++) sum += Math.exp(-v * x)
    expect(harmonic.partitionFunction).toBeCloseTo(sum, 12)
    expect(harmonic.populations[1].fraction).toBeCloseTo(Math.exp(-x) / sum, 12)
  })
  it('anharmonic ladder stops at the last bound level and warns when it matters', () => {
    // Morse-like ladder: ω_e = 200, ω_e x_e = 20 cm^-1 → bound levels v = 0..4 (v < ω_e/2ω_e x_e = 5).
    const evaluation = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '200 cm^-1', anharmonicity: '20 cm^-1' }], temperature: '2000 K' } })
    expect(evaluation.result.modes[0].highestBoundLevel).toBe(4)
    expect(evaluation.warnings.join(' ')).toMatch(/dissociation/)
  })
  it('well-bottom zero lowers q by e^{-x/2} and adds the zero-point energy to U', () => {
    const ground = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '1000 cm^-1' }], temperature: '500 K' } }).result
    const bottom = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '1000 cm^-1' }], temperature: '500 K', energyZero: 'wellBottom' } }).result
    const x = (1000 * C2) / 500
    expect(bottom.partitionFunction / ground.partitionFunction).toBeCloseTo(Math.exp(-x / 2), 12)
    expect(bottom.molarInternalEnergy - ground.molarInternalEnergy).toBeCloseTo((GAS_CONSTANT * 500 * x) / 2, 6)
    expect(bottom.molarEntropy).toBeCloseTo(ground.molarEntropy, 10)
  })
})

describe('vibration: degenerate modes (issue 16)', () => {
  // A mode of degeneracy d has C(v+d-1, v) states at total quantum number v (Herzberg, Infrared
  // and Raman Spectra of Polyatomic Molecules, 1945, ch. II; McQuarrie, Statistical Mechanics,
  // ch. 8). Reference here: brute-force enumeration of d independent 1-D oscillators.
  function enumerated(x: number, d: number, top: number): number[] {
    const weights = new Array(top + 1).fill(0)
    const visit = (remaining: number, used: number) => {
      if (remaining === 0) {
        if (used <= top) weights[used] += Math.exp(-used * x)
        return
      }
      for (let n = 0; used + n <= top; n++) visit(remaining - 1, used + n)
    }
    visit(d, 0)
    return weights
  }
  it.each([
    ['CO2 bend ν2, d = 2', '667.4 cm^-1', 2],
    ['CH4 ν4, d = 3', '1306 cm^-1', 3],
  ])('%s at 1000 K: per-level fractions equal the enumerated states', (_name, wavenumber, d) => {
    // Fundamentals: CO2 ν2 = 667.4 cm^-1, CH4 ν4 = 1306 cm^-1 (Shimanouchi, NSRDS-NBS 39, 1972; quoted from memory).
    const result = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber, degeneracy: d }], temperature: '1000 K' } }).result
    const mode = result.modes[0]
    const x = (Number.parseFloat(wavenumber) * C2) / 1000
    const weights = enumerated(x, d, 60)
    const total = weights.reduce((sum: number, weight: number) => sum + weight, 0)
    mode.populations.slice(0, 20).forEach((level: { v: number; degeneracy: number; fraction: number }) => {
      expect(Math.abs(level.fraction / (weights[level.v]! / total) - 1)).toBeLessThan(1e-10)
    })
    expect(mode.populations[1].degeneracy).toBe(d)
    expect(mode.populations[2].degeneracy).toBe((d * (d + 1)) / 2)
    // The mode's q is that of d oscillators: q1^d, so the per-component q is q1.
    expect(Math.abs(mode.partitionFunction * -Math.expm1(-x) - 1)).toBeLessThan(1e-12)
    const sum = mode.populations.reduce((acc: number, level: { fraction: number }) => acc + level.fraction, 0)
    expect(Math.abs(sum - 1)).toBeLessThan(1e-11)
  })
  it('regression: the v = 1 fraction of a doubly degenerate bend is not that of a 1-D oscillator', () => {
    const x = (667.4 * C2) / 1000
    const bend = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '667.4 cm^-1', degeneracy: 2 }], temperature: '1000 K' } }).result.modes[0]
    // p1 = 2 e^{-x} (1 - e^{-x})², not e^{-x} (1 - e^{-x}).
    expect(bend.populations[1].fraction).toBeCloseTo(2 * Math.exp(-x) * (1 - Math.exp(-x)) ** 2, 12)
  })
  it('an anharmonic degenerate mode uses G(v) = ω(v + d/2) - ωx(v + d/2)² with C(v+d-1, v) states', () => {
    const result = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '600 cm^-1', anharmonicity: '3 cm^-1', degeneracy: 2 }], temperature: '2000 K' } }).result.modes[0]
    const G = (v: number) => 600 * (v + 1) - 3 * (v + 1) ** 2
    // Last bound level: G(v) - G(v-1) = ω - ωx(2v + 1) > 0 for v < 99.5, so v = 99.
    expect(result.highestBoundLevel).toBe(99)
    let q = 0
    for (let v = 0; v <= 99; v++) q += (v + 1) * Math.exp((-(G(v) - G(0)) * C2) / 2000)
    expect(Math.abs(result.populations[3].fraction / ((4 * Math.exp((-(G(3) - G(0)) * C2) / 2000)) / q) - 1)).toBeLessThan(1e-9)
    expect(result.zeroPointEnergyJ / (G(0) * 100 * PLANCK_CONSTANT * SPEED_OF_LIGHT)).toBeCloseTo(1, 12)
  })
})

describe('vibration: one rule for the largest v (issue 16)', () => {
  it('a harmonic mode and an almost harmonic anharmonic one stop at the same v, and the rule is stated', () => {
    const harmonic = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '1000 cm^-1' }], temperature: '1500 K' } })
    const almost = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '1000 cm^-1', anharmonicity: '1e-9 cm^-1' }], temperature: '1500 K' } })
    const a = harmonic.result.modes[0]
    const b = almost.result.modes[0]
    expect(Math.abs(a.highestQuantumNumberSummed - b.highestQuantumNumberSummed)).toBeLessThanOrEqual(1)
    expect(a.summationStop).toBe('converged')
    expect(b.summationStop).toBe('converged')
    // The levels above v_max hold less than the tolerance: e^{-(v+1)x} for a 1-D harmonic ladder.
    const x = (1000 * C2) / 1500
    expect(Math.exp(-(a.highestQuantumNumberSummed + 1) * x)).toBeLessThan(harmonic.result.summationTolerance)
    expect(Math.exp(-a.highestQuantumNumberSummed * x)).toBeGreaterThanOrEqual(harmonic.result.summationTolerance)
    expect(Math.abs(b.partitionFunction / a.partitionFunction - 1)).toBeLessThan(1e-8)
    expect(harmonic.warnings.join(' ')).toMatch(/summed up to the first v above which the levels hold less than 1×10⁻¹²/)
  })
  it('an anharmonic ladder hot enough to reach dissociation stops there and warns about the levels near it', () => {
    const evaluation = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '200 cm^-1', anharmonicity: '2 cm^-1' }], temperature: '3000 K' } })
    const mode = evaluation.result.modes[0]
    expect(mode.summationStop).toBe('dissociation')
    expect(mode.highestQuantumNumberSummed).toBe(49)
    expect(evaluation.warnings.join(' ')).toMatch(/levels near dissociation/)
  })
  it('maxQuantum below convergence truncates harmonic and anharmonic sums alike, with a warning', () => {
    const evaluation = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: '300 cm^-1' }, { wavenumber: '300 cm^-1', anharmonicity: '1e-9 cm^-1' }], temperature: '1000 K', maxQuantum: 3 } })
    const [harmonic, anharmonic] = evaluation.result.modes
    expect(harmonic.summationStop).toBe('maxQuantum')
    expect(anharmonic.summationStop).toBe('maxQuantum')
    expect(Math.abs(harmonic.partitionFunction / anharmonic.partitionFunction - 1)).toBeLessThan(1e-8)
    const x = (300 * C2) / 1000
    expect(harmonic.partitionFunction).toBeCloseTo(1 + Math.exp(-x) + Math.exp(-2 * x) + Math.exp(-3 * x), 12)
    expect(evaluation.warnings.join(' ')).toMatch(/maxQuantum\) before it converged/)
  })
})

describe('rotation', () => {
  it('CO-like rotor at 298.15 K: q ≈ 107.8 and J_max = 7', () => {
    // CO B0 = 1.9225 cm^-1 (Huber & Herzberg); q ≈ kT/hcB = 107.8 and J_max ≈ √(kT/2hcB) - ½ = 6.8 (Atkins, Topic 12C).
    const result = evaluate({ kind: 'rotation', input: { rotationalConstant: '1.9225 cm^-1', temperature: '298.15 K' } }).result
    expect(result.partitionFunction).toBeCloseTo(108.12, 1)
    expect(result.mostPopulatedJ).toBe(7)
    expect(result.mostPopulatedJContinuous).toBeCloseTo(6.84, 1)
    const sum = result.populations.reduce((total: number, level: { fraction: number }) => total + level.fraction, 0)
    expect(sum).toBeCloseTo(1, 12)
  })
  it('nuclear-spin weights: H2-like rotor at 20 K is mostly J = 0 (para) and J = 1 (ortho)', () => {
    // H2 B = 60.85 cm^-1; weights 1 (even J, para) and 3 (odd J, ortho) (Atkins, Topic 12D).
    const result = evaluate({ kind: 'rotation', input: { rotationalConstant: '60.85 cm^-1', nuclearSpinWeights: { even: 1, odd: 3 }, temperature: '20 K' } }).result
    expect(result.populations[0].J).toBe(0)
    expect(result.populations[0].fraction + result.populations[1].fraction).toBeCloseTo(1, 6)
  })
  it('zero weights leave forbidden J out instead of reporting -Infinity', () => {
    const result = evaluate({ kind: 'rotation', input: { rotationalConstant: '0.39022 cm^-1', nuclearSpinWeights: { even: 1, odd: 0 }, temperature: '300 K' } }).result
    expect(result.populations.every((level: { J: number }) => level.J % 2 === 0)).toBe(true)
    // With weights (1, 0) the high-temperature q is T/(2Θ) (the weights stand for σ = 2); the exact sum agrees closely.
    expect(result.partitionFunction / result.correctedHighTemperaturePartitionFunction).toBeCloseTo(1, 3)
  })
  it('regression (issue 16): spin weights and σ = 2 do not count the symmetry twice', () => {
    // 12C16O2: B0 = 0.39022 cm^-1 (NIST CCCBDB, quoted from memory), weights 1 (even J) and 0 (odd J)
    // because the 16O nuclei are spinless bosons (Herzberg, Infrared and Raman Spectra, 1945, ch. I).
    // q is the sum over the allowed (even) J alone, ≈ T/(2Θ_rot) (McQuarrie, Statistical Mechanics, eq. 6-41);
    // the old engine divided that sum by σ = 2 again and gave half of it.
    const withSigma = evaluate({ kind: 'rotation', input: { rotationalConstant: '0.39022 cm^-1', symmetryNumber: 2, nuclearSpinWeights: { even: 1, odd: 0 }, temperature: '300 K' } })
    const theta = 0.39022 * C2
    let evenSum = 0
    for (let J = 0; J < 400; J += 2) evenSum += (2 * J + 1) * Math.exp((-theta * J * (J + 1)) / 300)
    expect(Math.abs(withSigma.result.partitionFunction / evenSum - 1)).toBeLessThan(1e-12)
    expect(Math.abs(withSigma.result.partitionFunction / (300 / (2 * theta)) - 1)).toBeLessThan(2e-3)
    expect(withSigma.result.symmetryTreatment).toBe('nuclearSpinWeights')
    expect(withSigma.result.symmetryNumberDivided).toBe(1)
    expect(withSigma.warnings.join(' ')).toMatch(/σ = 2 is implied/)
    // The same molecule described by σ = 2 alone has (at 300 K, Θ_rot/T ≈ 0.002) the same q and S within 1e-5 R.
    const sigmaOnly = evaluate({ kind: 'rotation', input: { rotationalConstant: '0.39022 cm^-1', symmetryNumber: 2, temperature: '300 K' } }).result
    expect(Math.abs(withSigma.result.partitionFunction / sigmaOnly.partitionFunction - 1)).toBeLessThan(1e-5)
    expect(Math.abs(withSigma.result.molarEntropy - sigmaOnly.molarEntropy)).toBeLessThan(1e-5 * GAS_CONSTANT)
  })
  it('truncation by maxJ is reported', () => {
    const evaluation = evaluate({ kind: 'rotation', input: { rotationalConstant: '1.9225 cm^-1', temperature: '298.15 K', maxJ: 5 } })
    expect(evaluation.result.highestJ).toBe(5)
    expect(evaluation.warnings.join(' ')).toMatch(/maxJ/)
  })
})

describe('spin', () => {
  it('Larmor frequency input gives the same field', () => {
    const result = evaluate({ kind: 'spin', input: { nucleus: '1H', larmorFrequency: '400 MHz', temperature: '298.15 K' } }).result
    expect(result.field).toBeCloseTo(9.3947, 3)
  })
  it('15N (negative γ) has negative polarization; spin-1 has three levels', () => {
    expect(evaluate({ kind: 'spin', input: { nucleus: '15N', field: '9.4 T', temperature: '300 K' } }).result.polarization).toBeLessThan(0)
    const deuteron = evaluate({ kind: 'spin', input: { gyromagneticRatio: '41.065 rad/(us T)', spinQuantumNumber: 1, field: '9.4 T', temperature: '300 K' } }).result
    expect(deuteron.levels.length).toBe(3)
    expect(deuteron.polarization / deuteron.highTemperaturePolarization).toBeCloseTo(1, 5)
  })
})

describe('microstates', () => {
  it('N = Q = 30: 5604 distributions whose W sum to C(59, 30)', () => {
    const result = evaluate({ kind: 'microstates', input: { oscillators: { count: 30, quanta: 30 } } }).result
    expect(result.distributionCount).toBe(5604) // p(30) = 5604 partitions (OEIS A000041)
    expect(result.totalMicrostates).toBe('59132290782430712') // C(59, 30)
    const probability = result.distributions.reduce((sum: number, distribution: { probability: number }) => sum + distribution.probability, 0)
    expect(probability).toBeCloseTo(1, 10)
  })
  it('beyond the enumeration limit it stops with a message and uses log-gamma', () => {
    const evaluation = evaluate({ kind: 'microstates', input: { oscillators: { count: 1000, quanta: 1000 } } })
    expect(evaluation.result.enumerationComplete).toBe(false)
    expect(evaluation.result.message).toMatch(/enumeration stopped/)
    expect(evaluation.result.boltzmannPrediction.shareOfLnTotal).toBeGreaterThan(0.9)
    expect(evaluation.result.boltzmannPrediction.shareOfLnTotal).toBeLessThanOrEqual(1.0000001)
  })
  it('particles on levels with a total energy', () => {
    // Three distinguishable particles on levels 0, 1, 2, 3 (units ε) with E = 3ε: {3,0,0,0}... W sums to 10.
    const result = evaluate({ kind: 'microstates', input: { levels: { energies: ['0 K', '1 K', '2 K', '3 K'], particles: 3, totalEnergy: '3 K' } } }).result
    expect(result.distributionCount).toBe(3)
    expect(result.totalMicrostates).toBe('10')
    expect(result.mostProbable.occupations).toEqual([1, 1, 1, 0])
  })
})

describe('boltzmannPlot', () => {
  it('recovers the temperature of synthetic lines', () => {
    const temperature = 4321
    const lines = [1000, 5000, 12000, 20000].map((wavenumber, index) => ({
      upperEnergy: `${wavenumber} cm^-1`,
      degeneracy: index + 1,
      intensity: (index + 1) * Math.exp(-(wavenumber * C2) / temperature) * 7,
      uncertainty: 0.001 * (index + 1) * Math.exp(-(wavenumber * C2) / temperature) * 7,
    }))
    const result = evaluate({ kind: 'boltzmannPlot', input: { lines } }).result
    expect(result.temperature).toBeCloseTo(temperature, 5)
    expect(result.rSquared).toBeCloseTo(1, 10)
    expect(result.temperatureUncertainty).toBeGreaterThan(0)
  })
})

describe('thermochemistry', () => {
  it('G - H(0) = H - H(0) - TS and Cp - Cv = R', () => {
    const result = evaluate({ kind: 'thermochemistry', input: { molarMass: '18.015 g/mol', shape: 'nonlinear', rotationalConstants: ['27.88 cm^-1', '14.51 cm^-1', '9.28 cm^-1'], symmetryNumber: 2, vibrations: [{ wavenumber: '3657 cm^-1' }, { wavenumber: '1595 cm^-1' }, { wavenumber: '3756 cm^-1' }], temperature: '298.15 K' } })
    const totals = evaluation(result).totals
    expect(totals.gibbsMinusH0).toBeCloseTo(totals.enthalpyMinusH0 - 298.15 * totals.entropy, 6)
    expect(totals.heatCapacityP - totals.heatCapacityV).toBeCloseTo(GAS_CONSTANT, 10)
    // H2O: S°(298.15 K) = 188.835 J/(mol K) (CODATA Key Values 1989); RRHO lands within about 0.2.
    expect(Math.abs(totals.entropy - 188.835)).toBeLessThan(0.3)
  })
  it('warns about soft modes', () => {
    const evaluation = evaluate({ kind: 'thermochemistry', input: { molarMass: '100 g/mol', shape: 'nonlinear', rotationalConstants: ['0.1 cm^-1', '0.05 cm^-1', '0.03 cm^-1'], vibrations: [{ wavenumber: '45 cm^-1' }], temperature: '298.15 K' } })
    expect(evaluation.warnings.join(' ')).toMatch(/below about 100 cm⁻¹/)
  })
})

function evaluation(value: { result: any }) {
  return value.result
}

describe('sweep and solveTemperature', () => {
  const baseInput = { levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 3 }] }
  it('sweeps a level fraction over a logarithmic grid', () => {
    const result = evaluate({ kind: 'sweep', input: { kind: 'levels', baseInput, start: '10 K', stop: '1000 K', points: 3, spacing: 'logarithmic', outputs: ['levels[1].fraction', 'partitionFunction'] } }).result
    expect(result.temperatures[1]).toBeCloseTo(100, 10)
    const x = (200 * C2) / 100
    expect(result.series[0].values[1]).toBeCloseTo((3 * Math.exp(-x)) / (1 + 3 * Math.exp(-x)), 12)
    expect(result.series[1].output).toBe('partitionFunction')
  })
  it('solves for the temperature where the upper level holds half the particles', () => {
    // 3 e^{-x} = 1 → x = ln 3 → T = hcν̃/(k ln 3).
    const result = evaluate({ kind: 'solveTemperature', input: { kind: 'levels', baseInput, output: 'levels[1].fraction', target: 0.5, lower: '10 K', upper: '2000 K' } }).result
    expect(result.temperature).toBeCloseTo((200 * C2) / Math.log(3), 6)
    expect(result.value).toBeCloseTo(0.5, 10)
  })
})
