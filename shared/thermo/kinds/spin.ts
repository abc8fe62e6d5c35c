/**
 * Kind `spin`: Zeeman levels of a nucleus in a field. E_m = -m ħ γ B for m = -I..I;
 * populations by Boltzmann; polarization P = <m>/I (for I = ½, P = tanh(ħγB/2kT));
 * Larmor frequency ν = |γ| B / 2π (Levitt, Spin Dynamics, 2nd ed., ch. 2 and 11).
 */
import { z } from 'zod'
import { BOLTZMANN_CONSTANT, REDUCED_PLANCK_CONSTANT } from '../constants'
import { boltzmannStatistics } from '../numerics'
import { describeInput, quantityField, strictObject } from '../schema'
import { toGyromagneticRatio, toHertz, toTesla, messageNumber } from '../units'
import { temperatureField } from './common'

/**
 * Gyromagnetic ratios in rad s^-1 T^-1 and spins. 1H: CODATA 2018 proton gyromagnetic ratio
 * γ_p = 2.675 221 8744 × 10^8 s^-1 T^-1 (bare proton). The others: Harris et al., NMR
 * nomenclature, Pure Appl. Chem. 73, 1795 (2001), Table 1 (γ/10^7 rad s^-1 T^-1: 13C 6.728 284,
 * 15N -2.712 618 04, 19F 25.181 48, 31P 10.8394; quoted from memory of that table, and checked
 * against its frequency ratios Ξ to 10^-3 in tests/unit/thermo/references.test.ts).
 */
export const NUCLEI = {
  '1H': { gyromagneticRatio: 2.6752218744e8, spin: 0.5, source: 'CODATA 2018 (proton)' },
  '13C': { gyromagneticRatio: 6.728284e7, spin: 0.5, source: 'Harris et al., Pure Appl. Chem. 73, 1795 (2001)' },
  '15N': { gyromagneticRatio: -2.71261804e7, spin: 0.5, source: 'Harris et al., Pure Appl. Chem. 73, 1795 (2001)' },
  '19F': { gyromagneticRatio: 2.518148e8, spin: 0.5, source: 'Harris et al., Pure Appl. Chem. 73, 1795 (2001)' },
  '31P': { gyromagneticRatio: 1.08394e8, spin: 0.5, source: 'Harris et al., Pure Appl. Chem. 73, 1795 (2001)' },
} as const

export type NucleusName = keyof typeof NUCLEI

const spinNumber = z
  .union([z.number(), z.string()], { error: (issue) => `expected a spin quantum number such as 1/2, 1 or 3/2, got ${describeInput(issue.input)}` })
  .transform((value, context) => {
    let number = typeof value === 'number' ? value : Number.NaN
    if (typeof value === 'string') {
      const fraction = /^\s*(\d+)\s*\/\s*2\s*$/.exec(value)
      number = fraction ? Number(fraction[1]) / 2 : /^\s*\d+(\.\d*)?\s*$/.test(value) ? Number(value) : Number.NaN
    }
    if (!(number > 0) || !Number.isInteger(2 * number) || number > 50) {
      context.issues.push({ code: 'custom', message: `expected a spin quantum number that is a positive multiple of 1/2 (1/2, 1, 3/2, ...), got ${describeInput(value)}`, input: value })
      return z.NEVER
    }
    return number
  })

export const spinSchema = strictObject({
  nucleus: z.enum(Object.keys(NUCLEI) as [NucleusName, ...NucleusName[]], { error: `expected one of ${Object.keys(NUCLEI).join(', ')} (or give gyromagneticRatio and spinQuantumNumber)` }).optional(),
  gyromagneticRatio: quantityField('2.6752218744e8 s^-1 T^-1', (text) => toGyromagneticRatio(text, '')).optional(),
  spinQuantumNumber: spinNumber.optional(),
  field: quantityField('9.4 T', (text) => toTesla(text, '')).optional(),
  larmorFrequency: quantityField('400 MHz', (text) => toHertz(text, '')).optional(),
  temperature: temperatureField,
}).superRefine((input, context) => {
  if ((input.nucleus === undefined) === (input.gyromagneticRatio === undefined)) {
    context.addIssue({ code: 'custom', message: 'give either a nucleus from the table or a gyromagneticRatio, one of the two', path: [input.nucleus === undefined ? 'nucleus' : 'gyromagneticRatio'] })
  }
  if (input.gyromagneticRatio !== undefined && input.spinQuantumNumber === undefined) {
    context.addIssue({ code: 'custom', message: 'with a custom gyromagnetic ratio, give the spin quantum number too (for example 1/2)', path: ['spinQuantumNumber'] })
  }
  if ((input.field === undefined) === (input.larmorFrequency === undefined)) {
    context.addIssue({ code: 'custom', message: "give either the field (such as '9.4 T') or the Larmor frequency (such as '400 MHz'), one of the two", path: [input.field === undefined ? 'field' : 'larmorFrequency'] })
  }
})

export type SpinInput = z.output<typeof spinSchema>

export interface ZeemanLevel {
  m: number
  energyJ: number
  fraction: number
  log10Fraction: number
}

export interface SpinResult {
  temperature: number
  nucleus: string | null
  gyromagneticRatio: number
  spinQuantumNumber: number
  field: number
  larmorFrequency: number
  /** Energy gap between adjacent Zeeman levels, ħ|γ|B, J. */
  zeemanSplittingJ: number
  levels: ZeemanLevel[]
  /** <m>/I; positive when the lower-energy state has m > 0 (γ > 0). */
  polarization: number
  /** High-temperature (Curie-law) estimate ħγB(I+1)/(3kT). */
  highTemperaturePolarization: number
  /** N(lower)/N(upper) for two adjacent levels, e^{ħ|γ|B/kT}. */
  populationRatio: number
  units: Record<string, string>
}

/** Zeeman populations and polarization at temperature T. */
export function computeSpin(input: SpinInput, warnings: string[] = []): SpinResult {
  const temperature = input.temperature
  const table = input.nucleus ? NUCLEI[input.nucleus] : null
  const gamma = table ? table.gyromagneticRatio : input.gyromagneticRatio!
  const spin = input.spinQuantumNumber ?? table!.spin
  if (table && input.spinQuantumNumber !== undefined && input.spinQuantumNumber !== table.spin) {
    warnings.push(`${input.nucleus} has spin ${table.spin}; the spin quantum number given (${input.spinQuantumNumber}) was used instead.`)
  }
  const field = input.field ?? (2 * Math.PI * input.larmorFrequency!) / Math.abs(gamma)
  const splitting = REDUCED_PLANCK_CONSTANT * Math.abs(gamma) * field
  const levelCount = Math.round(2 * spin + 1)
  const ms: number[] = []
  const energies: number[] = []
  for (let index = 0; index < levelCount; index++) {
    const m = spin - index
    ms.push(m)
    energies.push(-m * REDUCED_PLANCK_CONSTANT * gamma * field)
  }
  const fractions = new Float64Array(levelCount)
  const log10Fractions = new Float64Array(levelCount)
  boltzmannStatistics(energies, null, temperature, fractions, log10Fractions)
  const x = splitting / (BOLTZMANN_CONSTANT * temperature)
  let meanM = 0
  for (let index = 0; index < levelCount; index++) meanM += ms[index]! * fractions[index]!
  // For I = ½ use tanh directly: the difference of two near-equal fractions loses digits.
  const polarization = spin === 0.5 ? Math.sign(gamma) * Math.tanh(x / 2) : meanM / spin
  if (x > 0.1) warnings.push(`ħγB/kT = ${messageNumber(x, 3)}: the high-temperature (Curie-law) polarization no longer applies; the Boltzmann value is given.`)
  return {
    temperature,
    nucleus: input.nucleus ?? null,
    gyromagneticRatio: gamma,
    spinQuantumNumber: spin,
    field,
    larmorFrequency: (Math.abs(gamma) * field) / (2 * Math.PI),
    zeemanSplittingJ: splitting,
    levels: ms.map((m, index) => ({ m, energyJ: energies[index]!, fraction: fractions[index]!, log10Fraction: log10Fractions[index]! })),
    polarization,
    highTemperaturePolarization: (Math.sign(gamma) * x * (spin + 1)) / 3,
    populationRatio: Math.exp(x),
    units: { temperature: 'K', gyromagneticRatio: 'rad s^-1 T^-1', field: 'T', larmorFrequency: 'Hz', energyJ: 'J per particle', zeemanSplittingJ: 'J' },
  }
}

export const spinKind = {
  title: 'Nuclear spin polarization',
  description: 'Zeeman level populations, thermal polarization and Larmor frequency of a nucleus in a magnetic field.',
  version: 1,
  schema: spinSchema,
  compute: computeSpin,
  temperatureField: 'temperature',
  exampleInput: { nucleus: '1H', field: '9.4 T', temperature: '298.15 K' },
}

