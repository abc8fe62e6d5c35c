// Thermochemistry of real molecules (issue 16): exact rigid-rotor sums, nuclear-spin statistics
// of hydrogen, the electronic ground state and the 3N−5/3N−6 mode count. Each reference value
// names its source beside it.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { BOLTZMANN_CONSTANT, GAS_CONSTANT, PLANCK_CONSTANT, SPEED_OF_LIGHT, evaluate } from '../../../shared/thermo/index'
import { asymmetricTopLevels, correctedClassicalTop, rotorLevels, tridiagonalEigenvalues } from '../../../shared/thermo/rotors'
import { atomsInFormula } from '../../../shared/thermo/kinds/thermochemistry'

const CM = PLANCK_CONSTANT * SPEED_OF_LIGHT * 100 // J per cm⁻¹
const R = GAS_CONSTANT

function thermochemistry(input: Record<string, unknown>) {
  return evaluate({ kind: 'thermochemistry', input: { temperature: '298.15 K', pressure: '1 bar', ...input } })
}

// H2O ground-state rotational constants A, B, C = 27.88, 14.51, 9.28 cm⁻¹ and fundamentals
// 3657, 1595, 3756 cm⁻¹ (NIST CCCBDB experimental values; quoted from memory).
const WATER = {
  molarMass: '18.015 g/mol',
  shape: 'nonlinear',
  rotationalConstants: ['27.88 cm-1', '14.51 cm-1', '9.28 cm-1'],
  vibrations: [{ wavenumber: '3657 cm-1' }, { wavenumber: '1595 cm-1' }, { wavenumber: '3756 cm-1' }],
}

describe('asymmetric-top levels', () => {
  it('J = 1 and J = 2 of H2O agree with the closed forms, with the right Ka Kc labels', () => {
    // Closed forms (Townes and Schawlow, Microwave Spectroscopy, 1955, Table 4-4; Gordy and Cook,
    // 1984, Table 7.3): 1_01 = B + C, 1_11 = A + C, 1_10 = A + B; 2_12 = A + B + 4C,
    // 2_11 = A + 4B + C, 2_21 = 4A + B + C, 2_02 / 2_20 = 2(A + B + C) ∓ 2√((B − C)² + (A − C)(A − B)).
    const [A, B, C] = [27.88, 14.51, 9.28]
    const root = 2 * Math.sqrt((B - C) ** 2 + (A - C) * (A - B))
    const expected: Record<string, number> = {
      '1 eo': B + C, '1 oo': A + C, '1 oe': A + B,
      '2 oe': A + B + 4 * C, '2 oo': A + 4 * B + C, '2 eo': 4 * A + B + C,
      '2 ee low': 2 * (A + B + C) - root, '2 ee high': 2 * (A + B + C) + root,
    }
    for (const J of [1, 2]) {
      const levels = asymmetricTopLevels(J, A, B, C)
      expect(levels.length).toBe(2 * J + 1)
      const ee = levels.filter((level) => !level.kaOdd && !level.kcOdd).map((level) => level.energy).sort((x, y) => x - y)
      for (const level of levels) {
        const label = `${J} ${level.kaOdd ? 'o' : 'e'}${level.kcOdd ? 'o' : 'e'}`
        const reference = label === '2 ee' ? (level.energy === ee[0] ? expected['2 ee low'] : expected['2 ee high']) : expected[label]
        expect(Math.abs(level.energy - reference!)).toBeLessThan(1e-12 * reference!)
      }
    }
  })

  it('the Wang-block labels agree with the τ = Ka − Kc ordering of each J (King, Hainer and Cross 1943)', () => {
    // The 2J+1 levels of a J, in rising energy, are τ = −J … J with Ka = ⌊(i+1)/2⌋, Kc = J − ⌊i/2⌋.
    fc.assert(
      fc.property(fc.double({ min: 1, max: 30, noNaN: true }), fc.double({ min: 0.05, max: 0.95, noNaN: true }), fc.double({ min: 0.05, max: 0.95, noNaN: true }), fc.integer({ min: 1, max: 25 }), (A, bShare, cShare, J) => {
        const B = A * bShare
        const C = B * cShare
        const levels = asymmetricTopLevels(J, A, B, C).sort((x, y) => x.energy - y.energy)
        levels.forEach((level, index) => {
          const ka = Math.floor((index + 1) / 2)
          const kc = J - Math.floor(index / 2)
          const neighbours = [levels[index - 1], levels[index + 1]].filter(Boolean).map((other) => Math.abs(other!.energy - level.energy))
          // Near-degenerate pairs (to rounding) may come in either order; their weights then multiply equal energies.
          if (Math.min(...neighbours) < 1e-9 * level.energy) return
          expect(level.kaOdd).toBe(ka % 2 === 1)
          expect(level.kcOdd).toBe(kc % 2 === 1)
        })
      }),
      { numRuns: 300 },
    )
  })

  it('the eigen-solver reproduces a tridiagonal matrix with known eigenvalues', () => {
    // The n×n matrix with 2 on the diagonal and −1 beside it has eigenvalues 2 − 2cos(kπ/(n+1)) (common practice).
    const n = 40
    const values = Array.from(tridiagonalEigenvalues(new Float64Array(n).fill(2), new Float64Array(n - 1).fill(-1))).sort((x, y) => x - y)
    values.forEach((value, index) => expect(Math.abs(value - (2 - 2 * Math.cos(((index + 1) * Math.PI) / (n + 1))))).toBeLessThan(1e-13))
  })

  it('a nearly symmetric top approaches the closed symmetric-top levels', () => {
    // CH3Cl-like prolate top, A = 5.2, B = C = 0.44 cm⁻¹ (illustrative values): E = B J(J+1) + (A − B) K².
    const kT = BOLTZMANN_CONSTANT * 50
    const exact = rotorLevels([5.2 * CM, 0.44 * CM, 0.44 * CM], kT, 200)
    const near = rotorLevels([5.2 * CM, 0.44 * CM * (1 + 1e-8), 0.44 * CM], kT, 200, true)
    const sum = (levels: { energies: number[]; degeneracies: number[] }) => levels.energies.reduce((total, energy, index) => total + levels.degeneracies[index]! * Math.exp(-energy / kT), 0)
    expect(Math.abs(sum(near) / sum(exact) - 1)).toBeLessThan(1e-7)
  })
})

describe('exact rotor sums against the classical form (issue 16)', () => {
  it('H2O at 298.15 K: the classical q is low by more than 1 %; with its first quantum correction it agrees to 3e-4', () => {
    const evaluation = thermochemistry({ ...WATER, symmetryNumber: 2 })
    const rotation = evaluation.result.contributions.rotational
    expect(evaluation.result.rotation.method).toBe('exactSum')
    expect(evaluation.result.rotation.rotorType).toBe('asymmetric top')
    const thetas = [27.88, 14.51, 9.28].map((constant) => (constant * CM) / BOLTZMANN_CONSTANT)
    // Classical q = (√π/σ)(T³/Θ_AΘ_BΘ_C)^{1/2} (McQuarrie, Statistical Mechanics, eq. 8-28).
    const classical = (Math.sqrt(Math.PI) / 2) * Math.sqrt(298.15 ** 3 / (thetas[0]! * thetas[1]! * thetas[2]!))
    expect(rotation.partitionFunction / classical - 1).toBeGreaterThan(0.01)
    const corrected = Math.exp(correctedClassicalTop(thetas, 2, 298.15).lnQ)
    expect(Math.abs(rotation.partitionFunction / corrected - 1)).toBeLessThan(3e-4)
    expect(evaluation.warnings.join(' ')).toMatch(/exact sum over rigid-rotor levels up to J = \d+/)
    // H2O S°(298.15 K) = 188.835 J/(mol K) (CODATA Key Values 1989); the rigid-rotor, harmonic
    // model lands within 0.15 (the rest is centrifugal distortion and anharmonicity).
    expect(Math.abs(evaluation.result.totals.entropy - 188.835)).toBeLessThan(0.15)
  })

  it('H2O at 50 K: the classical form is far off, the exact sum is used', () => {
    const exact = thermochemistry({ ...WATER, symmetryNumber: 2, temperature: '50 K' }).result.contributions.rotational.partitionFunction
    const thetas = [27.88, 14.51, 9.28].map((constant) => (constant * CM) / BOLTZMANN_CONSTANT)
    const classical = (Math.sqrt(Math.PI) / 2) * Math.sqrt(50 ** 3 / (thetas[0]! * thetas[1]! * thetas[2]!))
    expect(exact / classical - 1).toBeGreaterThan(0.05)
  })

  it('the corrected classical form converges to the exact sum within the stated next-term estimate', () => {
    // Over random tops: the relative gap between the exact sum and the corrected classical form
    // stays below (Θ_max/T)² Θ_max/Θ_min, the estimate the result states when it switches.
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 20, noNaN: true }), fc.double({ min: 0.1, max: 1, noNaN: true }), fc.double({ min: 0.1, max: 1, noNaN: true }), fc.double({ min: 5, max: 60, noNaN: true }), (A, bShare, cShare, ratio) => {
        const constants = [A, A * bShare, A * bShare * cShare]
        const temperature = (ratio * A * CM) / BOLTZMANN_CONSTANT
        const levels = rotorLevels(constants.map((constant) => constant * CM), BOLTZMANN_CONSTANT * temperature, 150)
        if (!levels.converged) return
        const kT = BOLTZMANN_CONSTANT * temperature
        const exact = levels.energies.reduce((total, energy, index) => total + levels.degeneracies[index]! * Math.exp(-energy / kT), 0)
        const corrected = correctedClassicalTop(constants.map((constant) => (constant * CM) / BOLTZMANN_CONSTANT), 1, temperature)
        expect(Math.abs(exact / Math.exp(corrected.lnQ) - 1)).toBeLessThan(corrected.nextTermEstimate)
      }),
      { numRuns: 40 },
    )
  })

  it('a heavy asymmetric top at high temperature uses the corrected classical form and says so', () => {
    const evaluation = thermochemistry({ molarMass: '46.07 g/mol', shape: 'nonlinear', rotationalConstants: ['1.15 cm-1', '0.31 cm-1', '0.27 cm-1'], symmetryNumber: 1, temperature: '1000 K' })
    expect(evaluation.result.rotation.method).toBe('classicalWithFirstCorrection')
    expect(evaluation.result.rotation.highestJSummed).toBeNull()
    expect(evaluation.result.rotation.nextTermEstimate).toBeLessThan(1e-4)
    expect(evaluation.warnings.join(' ')).toMatch(/classical partition function with its first quantum correction is used/)
  })

  it('symmetric and spherical tops use their closed-form levels', () => {
    // CH4: B0 = 5.241 cm⁻¹, σ = 12 (NIST CCCBDB; quoted from memory). NH3: A = B = 9.44, C = 6.20 cm⁻¹, σ = 3.
    const methane = thermochemistry({ molarMass: '16.043 g/mol', shape: 'nonlinear', rotationalConstants: ['5.241 cm-1', '5.241 cm-1', '5.241 cm-1'], symmetryNumber: 12 }).result
    expect(methane.rotation.rotorType).toBe('spherical top')
    const theta = (5.241 * CM) / BOLTZMANN_CONSTANT
    let sum = 0
    for (let J = 0; J < 200; J++) sum += (2 * J + 1) ** 2 * Math.exp((-theta * J * (J + 1)) / 298.15)
    expect(Math.abs(methane.contributions.rotational.partitionFunction / (sum / 12) - 1)).toBeLessThan(1e-12)
    const ammonia = thermochemistry({ molarMass: '17.031 g/mol', shape: 'nonlinear', rotationalConstants: ['9.44 cm-1', '9.44 cm-1', '6.20 cm-1'], symmetryNumber: 3 }).result
    expect(ammonia.rotation.rotorType).toBe('oblate symmetric top')
  })
})

describe('nuclear-spin statistics of hydrogen (issue 16)', () => {
  // H2 X¹Σg⁺: B0 = Be − αe/2 = 60.853 − 3.062/2 = 59.322 cm⁻¹, ΔG1/2 = 4161.17 cm⁻¹ (Huber and
  // Herzberg, Constants of Diatomic Molecules, 1979; quoted from memory). Weights: para (even J) 1,
  // ortho (odd J) 3 (Atkins' Physical Chemistry, Topic 12D).
  const hydrogen = (temperature: number, treatment: 'normal' | 'equilibrium') => thermochemistry({
    molarMass: '2.01588 g/mol',
    shape: 'linear',
    rotationalConstants: ['59.322 cm-1'],
    vibrations: [{ wavenumber: '4161.17 cm-1' }],
    nuclearSpin: { treatment, weights: { even: 1, odd: 3 } },
    temperature: `${temperature} K`,
  })

  it.each([
    [100, 28.154],
    [200, 27.447],
    [298.15, 28.836],
  ])('equilibrium H2 at %s K: Cp° = %s J/(mol K) (NIST-JANAF H2 table, ortho-para equilibrium; quoted from memory) within 0.1', (temperature, reference) => {
    // The residual (up to 0.09 J/(mol K)) is the rigid rotor's: the real levels are lowered by
    // centrifugal distortion (D0 ≈ 0.046 cm⁻¹), which this model leaves out.
    expect(Math.abs(hydrogen(temperature, 'equilibrium').result.totals.heatCapacityP - reference)).toBeLessThan(0.1)
  })

  it('normal H2 has no rotational heat capacity below 40 K (Cp° = 5/2 R), equilibrium H2 has its ortho–para peak', () => {
    // n-H2 keeps its ortho molecules in J = 1 and para in J = 0 at low temperature, so its Cp° is
    // 5/2 R up to about 40 K; e-H2 converts para to ortho and shows a maximum of C_rot above R
    // between 40 and 80 K (Woolley, Scott and Brickwedde, J. Res. NBS 41, 379 (1948), figures of
    // C_rot for n-H2 and e-H2; described from memory).
    for (const temperature of [20, 30, 40]) {
      expect(Math.abs(hydrogen(temperature, 'normal').result.totals.heatCapacityP - 2.5 * R)).toBeLessThan(0.01)
    }
    const peak = Math.max(...[40, 50, 60, 70, 80].map((temperature) => hydrogen(temperature, 'equilibrium').result.totals.heatCapacityP))
    expect(peak - 2.5 * R).toBeGreaterThan(R)
  })

  it('the low-temperature forms: e-H2 q = 1 + 9 e^{−2Θ/T} + 5 e^{−6Θ/T} + …; n-H2 a 1:3 mixture of para (1 + 5 e^{−6Θ/T}) and ortho (3 e^{−2Θ/T} + 7 e^{−12Θ/T})', () => {
    // McQuarrie, Statistical Mechanics (1976), §6-5 (common textbook forms). C/R is the variance of E/kT.
    const theta = (59.322 * CM) / BOLTZMANN_CONSTANT
    const T = 30
    const heatCapacityOverR = (levels: [number, number][]) => {
      const weights = levels.map(([energy, g]) => g * Math.exp(-energy / T))
      const total = weights.reduce((a, b) => a + b, 0)
      const mean = levels.reduce((sum, [energy], index) => sum + (weights[index]! * energy) / T, 0) / total
      return levels.reduce((sum, [energy], index) => sum + weights[index]! * (energy / T - mean) ** 2, 0) / total
    }
    const equilibrium = hydrogen(T, 'equilibrium').result.contributions.rotational.heatCapacityP / R
    expect(Math.abs(equilibrium - heatCapacityOverR([[0, 1], [2 * theta, 9], [6 * theta, 5], [12 * theta, 21]]))).toBeLessThan(1e-9)
    const normal = hydrogen(T, 'normal').result.contributions.rotational.heatCapacityP / R
    const para = heatCapacityOverR([[0, 1], [6 * theta, 5]])
    const ortho = heatCapacityOverR([[2 * theta, 3], [12 * theta, 7]])
    expect(Math.abs(normal - (0.25 * para + 0.75 * ortho))).toBeLessThan(1e-12)
  })

  it('at 298.15 K normal and equilibrium H2 agree, and S° is the ordinary σ = 2 value (130.68 J/(mol K), CODATA 1989)', () => {
    const normal = hydrogen(298.15, 'normal').result.totals
    const equilibrium = hydrogen(298.15, 'equilibrium').result.totals
    expect(Math.abs(normal.heatCapacityP - equilibrium.heatCapacityP)).toBeLessThan(0.01)
    expect(Math.abs(normal.entropy - equilibrium.entropy)).toBeLessThan(0.01)
    // CODATA Key Values (Cox, Wagman and Medvedev, 1989): S°(H2, 298.15 K) = 130.680 J/(mol K).
    expect(Math.abs(equilibrium.entropy - 130.68)).toBeLessThan(0.15)
  })

  it('spin weights imply σ: a contradicting symmetry number is refused, naming the field', () => {
    expect(() => thermochemistry({ molarMass: '2.01588 g/mol', shape: 'linear', rotationalConstants: ['59.322 cm-1'], symmetryNumber: 1, nuclearSpin: { treatment: 'equilibrium', weights: { even: 1, odd: 3 } } })).toThrow(/symmetryNumber.*imply σ = 2/)
    const implied = thermochemistry({ molarMass: '2.01588 g/mol', shape: 'linear', rotationalConstants: ['59.322 cm-1'], symmetryNumber: 2, nuclearSpin: { treatment: 'equilibrium', weights: { even: 1, odd: 3 } } })
    expect(implied.result.rotation.symmetryNumber).toBe(2)
  })

  it('weights per Ka/Kc class are refused for a symmetric top (NH3 needs weights by K), naming the field', () => {
    expect(() => thermochemistry({ molarMass: '17.031 g/mol', shape: 'nonlinear', rotationalConstants: ['9.44 cm-1', '9.44 cm-1', '6.20 cm-1'], nuclearSpin: { treatment: 'equilibrium', weights: { ee: 1, eo: 3, oe: 3, oo: 1 } } })).toThrow(/nuclearSpin.*symmetric or spherical top/)
  })

  it('H2O with its ortho/para weights gives the σ = 2 result at room temperature', () => {
    // H2O: levels with Ka + Kc even are para (weight 1), odd are ortho (weight 3) (Herzberg 1945, ch. I.3).
    const weighted = thermochemistry({ ...WATER, nuclearSpin: { treatment: 'equilibrium', weights: { ee: 1, eo: 3, oe: 3, oo: 1 } } }).result
    const plain = thermochemistry({ ...WATER, symmetryNumber: 2 }).result
    expect(weighted.rotation.symmetryNumber).toBe(2)
    expect(Math.abs(weighted.totals.entropy - plain.totals.entropy)).toBeLessThan(1e-3)
  })
})

describe('prompts where people go wrong (issue 16)', () => {
  it('O2 needs its triplet ground state: g = 3 adds R ln 3 and brings S° to the CODATA value', () => {
    // O2 X³Σg⁻: B0 = 1.4377 cm⁻¹, ΔG1/2 = 1556.4 cm⁻¹ (Huber and Herzberg 1979; quoted from memory);
    // S°(298.15 K) = 205.152 J/(mol K) (CODATA Key Values 1989).
    const oxygen = { molarMass: '31.9988 g/mol', shape: 'linear', formula: 'O2', rotationalConstants: ['1.4377 cm-1'], symmetryNumber: 2, vibrations: [{ wavenumber: '1556.4 cm-1' }] }
    const singlet = thermochemistry(oxygen)
    expect(singlet.warnings.join(' ')).toMatch(/triplet ground state such as O₂ X³Σg⁻ has g = 3/)
    const triplet = thermochemistry({ ...oxygen, electronicLevels: [{ energy: '0 cm-1', degeneracy: 3 }] }).result
    expect(triplet.totals.entropy - singlet.result.totals.entropy).toBeCloseTo(R * Math.log(3), 9)
    expect(Math.abs(triplet.totals.entropy - 205.152)).toBeLessThan(0.1)
  })

  it('the mode count is checked against 3N − 6 from a formula, naming both numbers', () => {
    const evaluation = thermochemistry({ ...WATER, symmetryNumber: 2, formula: 'H2O', vibrations: WATER.vibrations.slice(0, 2) })
    expect(evaluation.result.modeCount).toEqual({ given: 2, expected: 3, atoms: 3 })
    expect(evaluation.warnings.join(' ')).toMatch(/2 given \(counting degeneracy\), but a nonlinear molecule of 3 atoms has 3N − 6 = 3/)
  })

  it('CO2 with its doubly degenerate bend has 3N − 5 = 4 modes: no warning', () => {
    const evaluation = thermochemistry({ molarMass: '44.0095 g/mol', shape: 'linear', atomCount: 3, rotationalConstants: ['0.39022 cm-1'], symmetryNumber: 2, vibrations: [{ wavenumber: '1333 cm-1' }, { wavenumber: '667.4 cm-1', degeneracy: 2 }, { wavenumber: '2349.1 cm-1' }] })
    expect(evaluation.result.modeCount).toEqual({ given: 4, expected: 4, atoms: 3 })
    expect(evaluation.warnings.join(' ')).not.toMatch(/Vibrational modes/)
  })

  it('counts atoms in formulas with groups, and refuses what is not a formula', () => {
    expect(atomsInFormula('CH3OH')).toBe(6)
    expect(atomsInFormula('Ca(OH)2')).toBe(5)
    expect(atomsInFormula('C6H6')).toBe(12)
    expect(atomsInFormula('water')).toBeNull()
    expect(() => thermochemistry({ ...WATER, formula: 'water' })).toThrow(/formula/)
    expect(() => thermochemistry({ ...WATER, formula: 'H2O', atomCount: 4 })).toThrow(/atomCount.*3 atoms, not 4/)
  })
})
