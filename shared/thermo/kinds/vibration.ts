/**
 * Kind `vibration`: vibrational partition functions, populations and molar U, S, C_V.
 * Harmonic oscillator in closed form, q = 1/(1 - e^{-x}), x = hcν̃/kT = Θ_vib/T
 * (McQuarrie, Statistical Mechanics, eqs. 6-20 to 6-23); anharmonic ladder
 * G(v) = ω_e(v + ½) - ω_e x_e (v + ½)² summed explicitly up to the last bound level
 * (Herzberg, Spectra of Diatomic Molecules, 1950, ch. III; Atkins' Physical Chemistry, Topic 11C).
 */
import { z } from 'zod'
import { BOLTZMANN_CONSTANT, GAS_CONSTANT, LN10 } from '../constants'
import { boltzmannStatistics, finiteOrNull, molarFunctions } from '../numerics'
import { labelField, strictObject, wholeNumber } from '../schema'
import { joulesToWavenumber, messageNumber } from '../units'
import { energyField, positiveEnergyField, temperatureField } from './common'

const modeSchema = strictObject({
  label: labelField,
  wavenumber: positiveEnergyField,
  degeneracy: wholeNumber('a degeneracy: a whole number of at least 1').default(1),
  anharmonicity: energyField.refine((value) => value.joules >= 0, { error: 'expected an anharmonicity constant ω_e x_e of zero or more' }).optional(),
})

export const vibrationSchema = strictObject({
  modes: z.array(modeSchema, { error: 'expected a list of modes, each with a wavenumber' }).min(1, { error: 'the mode list is empty: give at least one mode' }),
  temperature: temperatureField,
  maxQuantum: wholeNumber('a highest vibrational quantum number: a whole number of at least 1').refine((value) => value <= 100_000, { error: 'expected at most 100000' }).optional(),
  energyZero: z.enum(['groundState', 'wellBottom'], { error: "expected 'groundState' or 'wellBottom'" }).default('groundState'),
})

export type VibrationInput = z.output<typeof vibrationSchema>

export interface VibrationalPopulation {
  v: number
  /** Energy above the chosen zero, J. */
  energyJ: number
  fraction: number
  log10Fraction: number
}

export interface ModeResult {
  label: string | null
  /** Harmonic wavenumber ω (or ω_e), cm^-1. */
  wavenumber: number
  /** Θ_vib = hcω/k, K. */
  vibrationalTemperature: number
  degeneracy: number
  model: 'harmonic' | 'anharmonic'
  /** q of one oscillator of this mode, from the chosen energy zero. */
  partitionFunction: number | null
  log10PartitionFunction: number
  zeroPointEnergyJ: number
  /** Last bound level of an anharmonic ladder, or null for harmonic modes. */
  highestBoundLevel: number | null
  populations: VibrationalPopulation[]
  /** Contributions of all `degeneracy` oscillators, J/mol and J/(mol K). */
  molarInternalEnergy: number
  molarEntropy: number
  molarHeatCapacity: number
}

export interface VibrationResult {
  temperature: number
  energyZero: 'groundState' | 'wellBottom'
  modes: ModeResult[]
  /** Product of q^g over modes (null if out of double range). */
  partitionFunction: number | null
  log10PartitionFunction: number
  molarInternalEnergy: number
  molarEntropy: number
  molarHeatCapacity: number
  units: Record<string, string>
}

/**
 * Harmonic-oscillator functions of x = Θ_vib/T, energy zero at v = 0 (McQuarrie eqs. 6-20–6-23):
 * ln q = -ln(1 - e^{-x}); U/RT = x/(e^x - 1); S/R = x/(e^x - 1) - ln(1 - e^{-x});
 * C_V/R = x² e^{-x}/(1 - e^{-x})². Written with expm1 so small and large x stay accurate.
 */
export function harmonicFunctions(x: number): { lnQ: number; energyOverRT: number; entropyOverR: number; heatCapacityOverR: number } {
  const oneMinus = -Math.expm1(-x)
  const lnQ = -Math.log(oneMinus)
  const energyOverRT = x / Math.expm1(x)
  const heatCapacityOverR = (x * x * Math.exp(-x)) / (oneMinus * oneMinus)
  return { lnQ, energyOverRT: Number.isFinite(energyOverRT) ? energyOverRT : 0, entropyOverR: (Number.isFinite(energyOverRT) ? energyOverRT : 0) + lnQ, heatCapacityOverR }
}

const POPULATION_TAIL = 1e-6
const MAX_REPORTED = 1000

/** Vibrational partition functions and populations of every mode at temperature T. */
export function computeVibration(input: VibrationInput, warnings: string[] = []): VibrationResult {
  const temperature = input.temperature
  const kT = BOLTZMANN_CONSTANT * temperature
  const wellBottom = input.energyZero === 'wellBottom'
  let totalLnQ = 0
  let totalU = 0
  let totalS = 0
  let totalC = 0
  const modes: ModeResult[] = []
  input.modes.forEach((mode, modeIndex) => {
    const omega = mode.wavenumber.joules
    const anharmonicity = mode.anharmonicity?.joules ?? 0
    const x = omega / kT
    const label = mode.label ?? null
    const name = label ? `mode '${label}'` : `mode ${modeIndex + 1}`
    let lnQ: number
    let internal: number
    let entropy: number
    let heatCapacity: number
    let zeroPoint: number
    let populations: VibrationalPopulation[]
    let highestBoundLevel: number | null = null
    if (anharmonicity === 0) {
      zeroPoint = omega / 2
      const functions = harmonicFunctions(x)
      lnQ = functions.lnQ - (wellBottom ? x / 2 : 0)
      internal = GAS_CONSTANT * temperature * functions.energyOverRT + (wellBottom ? (GAS_CONSTANT * temperature * x) / 2 : 0)
      entropy = GAS_CONSTANT * functions.entropyOverR
      heatCapacity = GAS_CONSTANT * functions.heatCapacityOverR
      const log10Ground = Math.log10(-Math.expm1(-x))
      let last: number
      if (input.maxQuantum !== undefined) last = input.maxQuantum
      else {
        // Tail beyond v = n is e^{-(n+1)x}; stop once it is below POPULATION_TAIL.
        last = Math.max(2, Math.min(MAX_REPORTED, Math.ceil(-Math.log(POPULATION_TAIL) / x) - 1))
      }
      populations = []
      for (let v = 0; v <= last; v++) {
        const log10Fraction = (-v * x) / LN10 + log10Ground
        populations.push({ v, energyJ: v * omega + (wellBottom ? zeroPoint : 0), fraction: Math.pow(10, log10Fraction), log10Fraction })
      }
    } else {
      // G(v) rises while ω_e - 2 ω_e x_e (v + 1) > 0; the last such v is the top bound level.
      const top = Math.max(0, Math.ceil(omega / (2 * anharmonicity)) - 1)
      highestBoundLevel = top
      const limit = input.maxQuantum !== undefined ? Math.min(top, input.maxQuantum) : Math.min(top, 100_000)
      const term = (v: number) => omega * (v + 0.5) - anharmonicity * (v + 0.5) * (v + 0.5)
      zeroPoint = term(0)
      const energies = new Float64Array(limit + 1)
      for (let v = 0; v <= limit; v++) energies[v] = term(v) - (wellBottom ? 0 : zeroPoint)
      const fractions = new Float64Array(limit + 1)
      const log10Fractions = new Float64Array(limit + 1)
      const statistics = boltzmannStatistics(energies, null, temperature, fractions, log10Fractions)
      const molar = molarFunctions(statistics, temperature)
      lnQ = statistics.lnPartitionFunction
      internal = molar.internalEnergy
      entropy = molar.entropy
      heatCapacity = molar.heatCapacity
      if (limit === top && fractions[limit]! > 1e-6) {
        warnings.push(`${name}: the anharmonic ladder ends at dissociation (last bound level v = ${top}) while that level still holds a fraction of ${messageNumber(fractions[limit]!, 3)}; the bound-level sum leaves out the continuum.`)
      } else if (limit < top && fractions[limit]! > 1e-6) {
        warnings.push(`${name}: the sum stops at v = ${limit} (maxQuantum) while that level still holds a fraction of ${messageNumber(fractions[limit]!, 3)}; raise maxQuantum.`)
      }
      let reportLast = limit
      if (input.maxQuantum === undefined) {
        let tail = 1
        reportLast = 0
        for (let v = 0; v <= limit; v++) {
          tail -= fractions[v]!
          reportLast = v
          if (v >= 2 && tail < POPULATION_TAIL) break
        }
        reportLast = Math.min(reportLast, MAX_REPORTED)
      }
      populations = []
      for (let v = 0; v <= reportLast; v++) {
        populations.push({ v, energyJ: energies[v]!, fraction: fractions[v]!, log10Fraction: log10Fractions[v]! })
      }
    }
    if (x < 0.1) {
      warnings.push(`${name}: kT is more than ten times the vibrational quantum (Θ_vib/T = ${messageNumber(x, 3)}); the mode is near its classical limit and real molecules would be far up an anharmonic ladder.`)
    }
    const degeneracy = mode.degeneracy
    totalLnQ += degeneracy * lnQ
    totalU += degeneracy * internal
    totalS += degeneracy * entropy
    totalC += degeneracy * heatCapacity
    modes.push({
      label,
      wavenumber: joulesToWavenumber(omega),
      vibrationalTemperature: omega / BOLTZMANN_CONSTANT,
      degeneracy,
      model: anharmonicity === 0 ? 'harmonic' : 'anharmonic',
      partitionFunction: finiteOrNull(Math.exp(lnQ)),
      log10PartitionFunction: lnQ / LN10,
      zeroPointEnergyJ: zeroPoint,
      highestBoundLevel,
      populations,
      molarInternalEnergy: degeneracy * internal,
      molarEntropy: degeneracy * entropy,
      molarHeatCapacity: degeneracy * heatCapacity,
    })
  })
  const q = Math.exp(totalLnQ)
  return {
    temperature,
    energyZero: input.energyZero,
    modes,
    partitionFunction: Number.isFinite(q) && q > 0 ? q : null,
    log10PartitionFunction: totalLnQ / LN10,
    molarInternalEnergy: totalU,
    molarEntropy: totalS,
    molarHeatCapacity: totalC,
    units: { wavenumber: 'cm^-1', vibrationalTemperature: 'K', energyJ: 'J per particle', molarInternalEnergy: 'J/mol', molarEntropy: 'J/(mol K)', molarHeatCapacity: 'J/(mol K)' },
  }
}

export const vibrationKind = {
  title: 'Vibrational ladder',
  description: 'Vibrational partition functions, level populations and molar energy, entropy and heat capacity of harmonic or anharmonic modes.',
  version: 1,
  schema: vibrationSchema,
  compute: computeVibration,
  temperatureField: 'temperature',
  exampleInput: {
    modes: [{ label: 'stretch (generic CO-like values)', wavenumber: '2169.8 cm^-1', anharmonicity: '13.3 cm^-1' }],
    temperature: '298.15 K',
    energyZero: 'groundState',
  },
}
