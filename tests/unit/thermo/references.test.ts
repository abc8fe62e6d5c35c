// Checks against published values outside the project (issue 3, "Tests against sources outside
// the project"). Each reference value names its source beside it.
import { describe, expect, it } from 'vitest'
import {
  AVOGADRO_CONSTANT,
  BOLTZMANN_CONSTANT,
  ELEMENTARY_CHARGE,
  GAS_CONSTANT,
  PLANCK_CONSTANT,
  SECOND_RADIATION_CONSTANT,
  SPEED_OF_LIGHT,
  evaluate,
} from '../../../shared/thermo/index'

function thermochemistry(input: Record<string, unknown>) {
  return evaluate({ kind: 'thermochemistry', input: { temperature: '298.15 K', pressure: '1 bar', ...input } }).result
}

describe('SI 2019 exact constants', () => {
  // BIPM, The International System of Units, 9th ed. (2019), Table 1: exact defining values.
  it('holds the defining values', () => {
    expect(PLANCK_CONSTANT).toBe(6.62607015e-34)
    expect(SPEED_OF_LIGHT).toBe(299792458)
    expect(BOLTZMANN_CONSTANT).toBe(1.380649e-23)
    expect(AVOGADRO_CONSTANT).toBe(6.02214076e23)
    expect(ELEMENTARY_CHARGE).toBe(1.602176634e-19)
  })
  it('derives c2 = hc/k = 1.438 776 877e-2 m K (CODATA 2018)', () => {
    // Truncated in CODATA after ten significant digits: compare relatively.
    expect(Math.abs(SECOND_RADIATION_CONSTANT / 1.438776877e-2 - 1)).toBeLessThan(1e-9)
  })
  it('derives R = 8.314 462 618 J/(mol K) (CODATA 2018)', () => {
    expect(GAS_CONSTANT).toBeCloseTo(8.314462618, 8)
  })
})

describe('Sackur–Tetrode, monatomic ideal gases at 298.15 K and 1 bar', () => {
  // CODATA Key Values for Thermodynamics (Cox, Wagman, Medvedev, 1989): S°(298.15 K) in J/(mol K).
  // Molar masses: IUPAC standard atomic weights (Ar 39.948, He 4.002602, Ne 20.1797).
  it.each([
    ['Ar', '39.948 g/mol', 154.846],
    ['He', '4.002602 g/mol', 126.153],
    ['Ne', '20.1797 g/mol', 146.328],
  ])('%s: S° = %s', (_name, molarMass, reference) => {
    const result = thermochemistry({ molarMass, shape: 'atom' })
    expect(Math.abs(result.totals.entropy - reference)).toBeLessThan(0.005)
    // Monatomic ideal gas: Cp = 5/2 R exactly in this model.
    expect(result.totals.heatCapacityP).toBeCloseTo(2.5 * GAS_CONSTANT, 10)
  })
})

describe('Rigid rotor / harmonic oscillator against CODATA Key Values', () => {
  // Spectroscopic constants (ground-state B0 = Be - αe/2 and fundamental wavenumbers) from
  // Huber & Herzberg, Constants of Diatomic Molecules (1979), as given in the NIST Chemistry
  // WebBook, and for CO2 from NIST CCCBDB (experimental rotational constant, Shimanouchi's
  // fundamentals). Values quoted from memory of those tables; they reproduce S° within 0.04.
  it('N2: S° = 191.609 J/(mol K) (CODATA 1989) within 0.05; Cp° = 29.124 (NIST-JANAF) within 0.15', () => {
    // N2 X1Σg+: Be = 1.99824, αe = 0.017318 → B0 = 1.98958 cm^-1; ΔG1/2 = 2329.91 cm^-1; σ = 2.
    const result = thermochemistry({
      molarMass: '28.0134 g/mol',
      shape: 'linear',
      rotationalConstants: ['1.98958 cm^-1'],
      symmetryNumber: 2,
      vibrations: [{ wavenumber: '2329.91 cm^-1' }],
    })
    expect(Math.abs(result.totals.entropy - 191.609)).toBeLessThan(0.05)
    expect(Math.abs(result.totals.heatCapacityP - 29.124)).toBeLessThan(0.15)
  })
  it('CO2: S° = 213.785 J/(mol K) (CODATA 1989) within 0.05', () => {
    // CO2: B0 = 0.39022 cm^-1 (CCCBDB); ν1 = 1333 (Fermi-resonance centre), ν2 = 667.4 (×2), ν3 = 2349.1 cm^-1; σ = 2.
    const result = thermochemistry({
      molarMass: '44.0095 g/mol',
      shape: 'linear',
      rotationalConstants: ['0.39022 cm^-1'],
      symmetryNumber: 2,
      vibrations: [{ wavenumber: '1333 cm^-1' }, { wavenumber: '667.4 cm^-1', degeneracy: 2 }, { wavenumber: '2349.1 cm^-1' }],
    })
    expect(Math.abs(result.totals.entropy - 213.785)).toBeLessThan(0.05)
  })
  it('HCl: S° = 186.902 J/(mol K) (CODATA 1989) within 0.05', () => {
    // H35Cl X1Σ+: Be = 10.59342, αe = 0.30718 → B0 = 10.4398 cm^-1; band origin 2885.98 cm^-1; σ = 1;
    // molar mass of natural HCl 36.461 g/mol. The residual (about 0.036) is the RRHO model's,
    // mainly centrifugal distortion and the 37Cl isotopologue, which this model leaves out.
    const result = thermochemistry({
      molarMass: '36.461 g/mol',
      shape: 'linear',
      rotationalConstants: ['10.4398 cm^-1'],
      symmetryNumber: 1,
      vibrations: [{ wavenumber: '2885.98 cm^-1' }],
    })
    expect(Math.abs(result.totals.entropy - 186.902)).toBeLessThan(0.05)
  })
})

describe('Nuclear spin polarization', () => {
  // Expected ≈ 3.22e-5 (issue 3) with the CODATA 2018 proton gyromagnetic ratio
  // γp = 2.675 221 8744e8 s^-1 T^-1; P = tanh(ħγB/2kT).
  it('1H at 9.4 T and 298.15 K', () => {
    const result = evaluate({ kind: 'spin', input: { nucleus: '1H', field: '9.4 T', temperature: '298.15 K' } }).result
    expect(result.polarization).toBeCloseTo(3.22e-5, 7)
    expect(result.larmorFrequency / 1e6).toBeCloseTo(400.2, 1)
  })
  it('the same through a custom γ in CODATA units', () => {
    const result = evaluate({ kind: 'spin', input: { gyromagneticRatio: '2.6752218744e8 s^-1 T^-1', spinQuantumNumber: '1/2', field: '9.4 T', temperature: '298.15 K' } }).result
    expect(result.polarization).toBeCloseTo(3.2212e-5, 8)
  })

  // The table's γ for 13C, 15N, 19F and 31P were written from memory of Harris et al. (2001). An
  // independent check: the Larmor frequency of each nucleus over that of 1H in the same field.
  // Reference: the frequency ratios Ξ of the IUPAC recommendations (Harris et al., Pure Appl.
  // Chem. 73, 1795 (2001), Table 1: 13C 25.145020 %, 15N 10.136767 %, 19F 94.094011 %, 31P
  // 40.480742 %; the 13C, 19F and 31P ratios also appear in Bruker's NMR frequency tables (2012),
  // e.g. 13C at 100.613 MHz beside 1H at 400.130 MHz; the 15N ratio is quoted from memory of
  // the IUPAC table). Ξ is measured on reference compounds (TMS, CH3NO2,
  // CFCl3, 85 % H3PO4) rather than bare nuclei, so the two ratios differ by shielding: here by
  // 2 × 10⁻⁴ (13C) to 9 × 10⁻⁴ (31P). The check therefore allows 10⁻³: it catches a wrong
  // leading digit or exponent, not an error in the last digits.
  it.each([
    ['13C', 0.25145020],
    ['15N', 0.10136767],
    ['19F', 0.94094011],
    ['31P', 0.40480742],
  ])('%s: Larmor frequency over that of 1H agrees with the IUPAC ratio Ξ', (nucleus, xi) => {
    const input = (name: string) => ({ kind: 'spin', input: { nucleus: name, field: '9.4 T', temperature: '298.15 K' } })
    const ratio = evaluate(input(nucleus)).result.larmorFrequency / evaluate(input('1H')).result.larmorFrequency
    expect(Math.abs(ratio / xi - 1)).toBeLessThan(1e-3)
  })
})

describe('Einstein solid', () => {
  // Schroeder, An Introduction to Thermal Physics (2000), eq. 2.9 and Table 2.1: Ω(N, q) = C(q + N - 1, q).
  it.each([
    [0, '1'],
    [1, '3'],
    [2, '6'],
    [3, '10'],
    [4, '15'],
  ])('N = 3, Q = %i has %s microstates', (quanta, expected) => {
    const result = evaluate({ kind: 'microstates', input: { oscillators: { count: 3, quanta } } }).result
    expect(result.totalMicrostates).toBe(expected)
    const summed = result.distributions.reduce((sum: bigint, distribution: { microstates: string }) => sum + BigInt(distribution.microstates), 0n)
    expect(summed.toString()).toBe(expected)
  })
})

describe('Two-level system with the upper level at kT (common textbook practice)', () => {
  // Upper fraction g e^{-1}/(1 + g e^{-1}): 0.2689 for g = 1, 0.4239 for g = 2.
  it.each([
    [1, Math.exp(-1) / (1 + Math.exp(-1)), 0.269],
    [2, (2 * Math.exp(-1)) / (1 + 2 * Math.exp(-1)), 0.424],
  ])('upper degeneracy %i', (degeneracy, exact, rounded) => {
    const result = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 K' }, { energy: '300 K', degeneracy }], temperature: '300 K' } }).result
    expect(result.levels[1].fraction).toBeCloseTo(exact, 12)
    expect(result.levels[1].fraction).toBeCloseTo(rounded, 3)
  })
})
