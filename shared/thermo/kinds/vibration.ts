/**
 * Kind `vibration`: vibrational partition functions, populations and molar U, S, C_V.
 * Harmonic oscillator in closed form, q = 1/(1 - e^{-x}), x = hcν̃/kT = Θ_vib/T
 * (McQuarrie, Statistical Mechanics, eqs. 6-20 to 6-23); anharmonic ladder
 * G(v) = ω_e(v + ½) - ω_e x_e (v + ½)² summed explicitly up to the last bound level
 * (Herzberg, Spectra of Diatomic Molecules, 1950, ch. III; Atkins' Physical Chemistry, Topic 11C).
 * A mode of degeneracy d (a linear molecule's bend, d = 2; a tetrahedral mode, d = 3) has
 * (v+d-1 choose v) states at total quantum number v, with G(v) = ω(v + d/2) - ωx(v + d/2)²
 * (Herzberg, Infrared and Raman Spectra, 1945, ch. II, eq. II,281 without the l-dependent term).
 *
 * One rule for the largest v (the same for harmonic and anharmonic modes): the sum stops at the
 * first v above which the levels provably hold less than SUMMATION_TOLERANCE of the population,
 * at the last bound level of an anharmonic ladder, or at maxQuantum, whichever comes first.
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
  /** Total quantum number of the mode (the sum over its d components). */
  v: number
  /** Number of states at v: (v+d-1 choose v) for a mode of degeneracy d. */
  degeneracy: number
  /** Energy above the chosen zero, J. */
  energyJ: number
  fraction: number
  log10Fraction: number
}

/** Why the sum over v stopped. */
export type SummationStop = 'converged' | 'dissociation' | 'maxQuantum' | 'levelLimit'

export interface ModeResult {
  label: string | null
  /** Harmonic wavenumber ω (or ω_e), cm^-1. */
  wavenumber: number
  /** Θ_vib = hcω/k, K. */
  vibrationalTemperature: number
  degeneracy: number
  model: 'harmonic' | 'anharmonic'
  /** q per component of this mode (the mode's q to the power 1/d), from the chosen energy zero. */
  partitionFunction: number | null
  log10PartitionFunction: number
  /** Zero-point energy of the whole mode (all d components), J. */
  zeroPointEnergyJ: number
  /** Last bound level of an anharmonic ladder, or null for harmonic modes. */
  highestBoundLevel: number | null
  /** The largest v in the sum (see SUMMATION_TOLERANCE and summationStop). */
  highestQuantumNumberSummed: number
  /** Why the sum stopped there. */
  summationStop: SummationStop
  /** Levels v = 0 … n with their degeneracies (at most MAX_LISTED of them). */
  populations: VibrationalPopulation[]
  /** Contributions of all `degeneracy` oscillators, J/mol and J/(mol K). */
  molarInternalEnergy: number
  molarEntropy: number
  molarHeatCapacity: number
}

export interface VibrationResult {
  temperature: number
  energyZero: 'groundState' | 'wellBottom'
  /** The share of the population the levels above the largest v summed may hold at most. */
  summationTolerance: number
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

/** The levels above the largest v summed hold at most this share of the population. */
export const SUMMATION_TOLERANCE = 1e-12
/** No sum runs past this many levels of one mode. */
const LEVEL_LIMIT = 100_000
/** At most this many levels of a mode are listed in the result. */
const MAX_LISTED = 1000
/** Population above this in the levels near dissociation earns a warning. */
const NEAR_DISSOCIATION_WARNING = 1e-6

/**
 * Largest v of a harmonic mode of degeneracy d at x = hcω/kT by the one rule. The share above v
 * is Σ_{w>v} p_w with p_w = C(w+d-1, w) e^{-wx} (1-e^{-x})^d; successive ratios
 * r_w = p_{w+1}/p_w = (w+d)/(w+1) e^{-x} fall with w, so once r < 1 the share is at most
 * p_{v+1}/(1 - r_{v+1}) (a geometric bound), which is what is tested.
 */
function harmonicLastLevel(x: number, d: number, limit: number): { last: number; stop: SummationStop } {
  const logGround = d * Math.log(-Math.expm1(-x))
  let logNext = logGround - x + Math.log(d) // ln p_1
  for (let v = 0; v < limit; v++) {
    // logNext is ln p_{v+1}; r_{v+1} = (v+1+d)/(v+2) e^{-x}.
    const ratio = ((v + 1 + d) / (v + 2)) * Math.exp(-x)
    if (ratio < 1 && logNext - Math.log1p(-ratio) < Math.log(SUMMATION_TOLERANCE)) return { last: v, stop: 'converged' }
    logNext += Math.log((v + 1 + d) / (v + 2)) - x
  }
  return { last: limit, stop: 'levelLimit' }
}

/** Vibrational partition functions and populations of every mode at temperature T. */
export function computeVibration(input: VibrationInput, warnings: string[] = []): VibrationResult {
  const temperature = input.temperature
  const kT = BOLTZMANN_CONSTANT * temperature
  const wellBottom = input.energyZero === 'wellBottom'
  const maxQuantum = input.maxQuantum ?? Infinity
  let totalLnQ = 0
  let totalU = 0
  let totalS = 0
  let totalC = 0
  const modes: ModeResult[] = []
  input.modes.forEach((mode, modeIndex) => {
    const omega = mode.wavenumber.joules
    const anharmonicity = mode.anharmonicity?.joules ?? 0
    const d = mode.degeneracy
    const x = omega / kT
    const label = mode.label ?? null
    const name = label ? `mode '${label}'` : `mode ${modeIndex + 1}`
    // G(v) of the whole mode from the bottom of the well (Herzberg's form; ωx = 0 is harmonic).
    const term = (v: number) => omega * (v + d / 2) - anharmonicity * (v + d / 2) * (v + d / 2)
    const zeroPoint = term(0)
    const shift = wellBottom ? 0 : zeroPoint
    let highestBoundLevel: number | null = null
    let last: number
    let stop: SummationStop
    if (anharmonicity === 0) {
      ({ last, stop } = harmonicLastLevel(x, d, Math.min(LEVEL_LIMIT, maxQuantum)))
      if (stop === 'levelLimit' && maxQuantum <= LEVEL_LIMIT) stop = 'maxQuantum'
    } else {
      // G(v) rises while G(v) - G(v-1) = ω - ωx(2v + d - 1) > 0; the last such v is the top bound level.
      // (The small allowance keeps a ratio such as 100.00000000000001 from a unit conversion at v < 50.)
      const top = Math.max(0, Math.ceil((omega / anharmonicity - d + 1) / 2 - 1e-9) - 1)
      highestBoundLevel = top
      last = Math.min(top, maxQuantum, LEVEL_LIMIT)
      stop = last === top ? 'dissociation' : last === maxQuantum ? 'maxQuantum' : 'levelLimit'
    }
    // Levels 0 … last with (v+d-1 choose v) states each (exact integers while below 2^53).
    const levelCount = last + 1
    const energies = new Float64Array(levelCount)
    const degeneracies = new Float64Array(levelCount)
    let states = 1
    for (let v = 0; v < levelCount; v++) {
      energies[v] = term(v) - shift
      degeneracies[v] = states
      states = (states * (v + d)) / (v + 1)
    }
    let fractions = new Float64Array(levelCount)
    let log10Fractions = new Float64Array(levelCount)
    let statistics = boltzmannStatistics(energies, degeneracies, temperature, fractions, log10Fractions)
    if (anharmonicity > 0) {
      // The same rule as for harmonic modes: stop where the levels above hold less than the tolerance.
      let tail = 0
      let converged = last
      for (let v = last; v >= 1; v--) {
        tail += fractions[v]!
        if (tail < SUMMATION_TOLERANCE) converged = v - 1
        else break
      }
      if (converged < last) {
        last = converged
        stop = 'converged'
        const count = last + 1
        fractions = new Float64Array(count)
        log10Fractions = new Float64Array(count)
        statistics = boltzmannStatistics(energies.subarray(0, count), degeneracies.subarray(0, count), temperature, fractions, log10Fractions)
      }
    }
    let lnQ: number
    let internal: number
    let entropy: number
    let heatCapacity: number
    if (anharmonicity === 0 && stop !== 'maxQuantum') {
      // Closed form: the complete sum, equal to the sum up to `last` within the tolerance.
      const functions = harmonicFunctions(x)
      lnQ = d * (functions.lnQ - (wellBottom ? x / 2 : 0))
      internal = d * (GAS_CONSTANT * temperature * functions.energyOverRT + (wellBottom ? (GAS_CONSTANT * temperature * x) / 2 : 0))
      entropy = d * GAS_CONSTANT * functions.entropyOverR
      heatCapacity = d * GAS_CONSTANT * functions.heatCapacityOverR
    } else {
      const molar = molarFunctions(statistics, temperature)
      lnQ = statistics.lnPartitionFunction
      internal = molar.internalEnergy
      entropy = molar.entropy
      heatCapacity = molar.heatCapacity
    }
    const lastFraction = fractions[last]!
    if (stop === 'dissociation') {
      // Levels in the top tenth of the well: the bound-level sum leaves out the continuum above them.
      const depth = term(last) - zeroPoint
      let nearShare = 0
      let firstNear = last
      for (let v = last; v >= 0 && term(v) - zeroPoint >= 0.9 * depth; v--) {
        nearShare += fractions[v]!
        firstNear = v
      }
      if (nearShare > NEAR_DISSOCIATION_WARNING) {
        warnings.push(`${name}: the levels near dissociation (v = ${firstNear} to the last bound level v = ${last}, the top tenth of the well) hold a fraction of ${messageNumber(nearShare, 3)}; the bound-level sum leaves out the continuum, so q, U, S and C are uncertain at this temperature.`)
      }
    } else if (stop === 'maxQuantum') {
      warnings.push(`${name}: the sum stops at v = ${last} (maxQuantum) before it converged; that level still holds a fraction of ${messageNumber(lastFraction, 3)}, so q, U, S and C are truncated; raise maxQuantum or leave it empty.`)
    } else if (stop === 'levelLimit') {
      warnings.push(anharmonicity === 0
        ? `${name}: the ladder needs more than ${LEVEL_LIMIT} levels to converge; q, U, S and C come from the closed harmonic form (all levels), and populations are listed up to v = ${Math.min(last, MAX_LISTED - 1)}.`
        : `${name}: the sum stops at ${LEVEL_LIMIT} levels before it converged or reached dissociation; q, U, S and C are truncated.`)
    }
    if (x < 0.1) {
      warnings.push(`${name}: kT is more than ten times the vibrational quantum (Θ_vib/T = ${messageNumber(x, 3)}); the mode is near its classical limit and real molecules would be far up an anharmonic ladder.`)
    }
    const listed = Math.min(last + 1, input.maxQuantum === undefined ? MAX_LISTED : LEVEL_LIMIT + 1)
    if (listed < last + 1) {
      warnings.push(`${name}: the sum runs to v = ${last}; populations are listed for v = 0 to ${listed - 1} only.`)
    }
    const populations: VibrationalPopulation[] = new Array(listed)
    for (let v = 0; v < listed; v++) {
      populations[v] = { v, degeneracy: degeneracies[v]!, energyJ: energies[v]!, fraction: fractions[v]!, log10Fraction: log10Fractions[v]! }
    }
    totalLnQ += lnQ
    totalU += internal
    totalS += entropy
    totalC += heatCapacity
    modes.push({
      label,
      wavenumber: joulesToWavenumber(omega),
      vibrationalTemperature: omega / BOLTZMANN_CONSTANT,
      degeneracy: d,
      model: anharmonicity === 0 ? 'harmonic' : 'anharmonic',
      partitionFunction: finiteOrNull(Math.exp(lnQ / d)),
      log10PartitionFunction: lnQ / d / LN10,
      zeroPointEnergyJ: zeroPoint,
      highestBoundLevel,
      highestQuantumNumberSummed: last,
      summationStop: stop,
      populations,
      molarInternalEnergy: internal,
      molarEntropy: entropy,
      molarHeatCapacity: heatCapacity,
    })
  })
  warnings.push(`Each mode is summed up to the first v above which the levels hold less than ${messageNumber(SUMMATION_TOLERANCE, 1)} of the population, the last bound level, or maxQuantum, whichever comes first: ${modes.map((mode, index) => `${mode.label ? `'${mode.label}'` : `mode ${index + 1}`} to v = ${mode.highestQuantumNumberSummed} (${STOP_WORDS[mode.summationStop]})`).join(', ')}.`)
  const q = Math.exp(totalLnQ)
  return {
    temperature,
    energyZero: input.energyZero,
    summationTolerance: SUMMATION_TOLERANCE,
    modes,
    partitionFunction: Number.isFinite(q) && q > 0 ? q : null,
    log10PartitionFunction: totalLnQ / LN10,
    molarInternalEnergy: totalU,
    molarEntropy: totalS,
    molarHeatCapacity: totalC,
    units: { wavenumber: 'cm⁻¹', vibrationalTemperature: 'K', energyJ: 'J per particle', molarInternalEnergy: 'J/mol', molarEntropy: 'J/(mol K)', molarHeatCapacity: 'J/(mol K)' },
  }
}

const STOP_WORDS: Record<SummationStop, string> = {
  converged: 'converged',
  dissociation: 'last bound level',
  maxQuantum: 'maxQuantum',
  levelLimit: `limit of ${LEVEL_LIMIT} levels`,
}

export const vibrationKind = {
  title: 'Vibrational ladder',
  description: 'Vibrational partition functions, level populations and molar energy, entropy and heat capacity of harmonic or anharmonic modes.',
  version: 2,
  schema: vibrationSchema,
  compute: computeVibration,
  temperatureField: 'temperature',
  exampleInput: {
    modes: [{ label: 'stretch (generic CO-like values)', wavenumber: '2169.8 cm^-1', anharmonicity: '13.3 cm^-1' }],
    temperature: '298.15 K',
    energyZero: 'groundState',
  },
}
