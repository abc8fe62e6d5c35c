/**
 * Kind `rotation`: the linear rotor. Levels E_J = B J(J+1) - D J²(J+1)², degeneracy 2J+1,
 * and either a symmetry number σ or nuclear-spin weights w_J for even and odd J, never both:
 * without weights q = (1/σ) Σ (2J+1) e^{-E_J/kT}; with weights q = Σ w_J (2J+1) e^{-E_J/kT},
 * which already leaves out the levels σ stands for (and counts the nuclear-spin states), so σ
 * is not divided again. High-temperature form q ≈ w̄ T/(σ' Θ_rot) and its first-order
 * correction q ≈ w̄ T/(σ' Θ_rot) (1 + Θ_rot/(3T)), with σ' = σ without weights and 1 with
 * them, w̄ = (w_even + w_odd)/2 (Mulholland 1928; McQuarrie,
 * Statistical Mechanics, eqs. 6-40 to 6-42); most populated J ≈ √(T/(2Θ_rot)) - ½
 * (Atkins' Physical Chemistry, Topic 12C).
 */
import { z } from 'zod'
import { BOLTZMANN_CONSTANT, GAS_CONSTANT } from '../constants'
import { boltzmannStatistics, molarFunctions } from '../numerics'
import { describeInput, strictObject, wholeNumber } from '../schema'
import { joulesToWavenumber, messageNumber } from '../units'
import { energyField, positiveEnergyField, temperatureField } from './common'

const spinWeight = z
  .number({ error: (issue) => `expected a nuclear-spin weight (a number of zero or more), got ${describeInput(issue.input)}` })
  .refine((value) => Number.isFinite(value) && value >= 0, { error: 'expected a nuclear-spin weight of zero or more' })

export const rotationSchema = strictObject({
  rotationalConstant: positiveEnergyField,
  centrifugalDistortion: energyField.refine((value) => value.joules >= 0, { error: 'expected a centrifugal distortion constant D of zero or more' }).optional(),
  symmetryNumber: wholeNumber('a symmetry number: 1 for a heteronuclear, 2 for a homonuclear linear molecule').default(1),
  nuclearSpinWeights: strictObject({ even: spinWeight, odd: spinWeight })
    .refine((weights) => weights.even + weights.odd > 0, { error: 'the even and odd weights cannot both be zero' })
    .optional(),
  temperature: temperatureField,
  maxJ: wholeNumber('a highest J: a whole number of zero or more', 0).refine((value) => value <= 1_000_000, { error: 'expected a highest J of at most 1000000' }).optional(),
})

export type RotationInput = z.output<typeof rotationSchema>

export interface RotationalPopulation {
  J: number
  /** (2J+1) times the nuclear-spin weight of J. */
  degeneracy: number
  energyJ: number
  /** E_J as a wavenumber, cm⁻¹. */
  wavenumber: number
  fraction: number
  log10Fraction: number
}

export interface RotationResult {
  temperature: number
  /** Θ_rot = B/k, K. */
  rotationalTemperature: number
  rotationalConstantWavenumber: number
  /** Exact sum over J: divided by σ without spin weights, spin-weighted (σ implied) with them. */
  partitionFunction: number
  /** How the symmetry of the molecule entered: through σ, or through the nuclear-spin weights. */
  symmetryTreatment: 'symmetryNumber' | 'nuclearSpinWeights'
  /** The number q was divided by: σ without spin weights, 1 with them. */
  symmetryNumberDivided: number
  /** w̄ T/(σ' Θ_rot). */
  highTemperaturePartitionFunction: number
  /** w̄ T/(σ' Θ_rot) (1 + Θ_rot/(3T)). */
  correctedHighTemperaturePartitionFunction: number
  populations: RotationalPopulation[]
  mostPopulatedJ: number
  /** √(T/(2Θ_rot)) - ½ (rigid rotor). */
  mostPopulatedJContinuous: number
  highestJ: number
  molarInternalEnergy: number
  molarEntropy: number
  molarHeatCapacity: number
  units: Record<string, string>
}

/** Exact rotational sum and populations of a linear rotor at temperature T. */
export function computeRotation(input: RotationInput, warnings: string[] = []): RotationResult {
  const temperature = input.temperature
  const kT = BOLTZMANN_CONSTANT * temperature
  const constant = input.rotationalConstant.joules
  const distortion = input.centrifugalDistortion?.joules ?? 0
  const weighted = input.nuclearSpinWeights !== undefined
  // The weights already remove the levels σ accounts for: dividing by σ as well counted the symmetry twice.
  const sigma = weighted ? 1 : input.symmetryNumber
  const weightEven = input.nuclearSpinWeights?.even ?? 1
  const weightOdd = input.nuclearSpinWeights?.odd ?? 1
  const theta = constant / BOLTZMANN_CONSTANT
  // With distortion, E_J turns over where B - 2D J(J+1) = 0: the formula stops being physical there.
  const turnoverJ = distortion > 0 ? Math.floor((-1 + Math.sqrt(1 + (2 * constant) / distortion)) / 2) : Infinity
  const peakJ = Math.max(0, Math.sqrt(temperature / (2 * theta)) - 0.5)
  const automatic = input.maxJ === undefined
  const hardLimit = Math.min(automatic ? 1_000_000 : input.maxJ!, turnoverJ)

  const js: number[] = []
  const energies: number[] = []
  const degeneracies: number[] = []
  let running = 0
  let J = 0
  for (; J <= hardLimit; J++) {
    const weight = J % 2 === 0 ? weightEven : weightOdd
    const product = J * (J + 1)
    const energy = constant * product - distortion * product * product
    if (weight > 0) {
      const degeneracy = (2 * J + 1) * weight
      js.push(J)
      energies.push(energy)
      degeneracies.push(degeneracy)
      const term = degeneracy * Math.exp(-energy / kT)
      running += term
      if (automatic && J > peakJ + 2 && term < 1e-17 * running) break
    }
  }
  const highestJ = js[js.length - 1] ?? 0
  const count = js.length
  const fractions = new Float64Array(count)
  const log10Fractions = new Float64Array(count)
  const statistics = boltzmannStatistics(energies, degeneracies, temperature, fractions, log10Fractions)
  const molar = molarFunctions(statistics, temperature)
  const lnQ = statistics.lnPartitionFunction - Math.log(sigma)
  const meanWeight = (weightEven + weightOdd) / 2
  const highTemperature = (meanWeight * temperature) / (sigma * theta)

  if (!automatic && fractions[count - 1]! > 1e-9) {
    warnings.push(`The sum stops at J = ${highestJ} (maxJ) while that level still holds a fraction of ${messageNumber(fractions[count - 1]!, 3)}: the partition function is truncated; raise maxJ.`)
  }
  if (Number.isFinite(turnoverJ) && highestJ >= turnoverJ && fractions[count - 1]! > 1e-9) {
    warnings.push(`Centrifugal distortion makes E_J fall beyond J = ${turnoverJ}; the sum stops there although that level still holds a fraction of ${messageNumber(fractions[count - 1]!, 3)}.`)
  }
  if (temperature < 5 * theta) {
    warnings.push(`T is only ${messageNumber(temperature / theta, 3)} times Θ_rot: the high-temperature forms are poor here; use the exact sum.`)
  }
  if (weighted) {
    warnings.push(input.symmetryNumber > 1
      ? `The nuclear-spin weights already count the symmetry (σ = ${input.symmetryNumber} is implied by them), so q is not divided by σ again; q counts the nuclear-spin states as weighted.`
      : 'q is summed with the nuclear-spin weights and counts the nuclear-spin states as weighted; no symmetry number is divided.')
  }
  if (sigma > 1 && !weighted && temperature < 5 * theta) {
    warnings.push('At this temperature the symmetry number alone does not describe a homonuclear molecule: give nuclear-spin weights for even and odd J.')
  }

  const populations: RotationalPopulation[] = new Array(count)
  for (let index = 0; index < count; index++) {
    populations[index] = {
      J: js[index]!,
      degeneracy: degeneracies[index]!,
      energyJ: energies[index]!,
      wavenumber: joulesToWavenumber(energies[index]!),
      fraction: fractions[index]!,
      log10Fraction: log10Fractions[index]!,
    }
  }
  return {
    temperature,
    rotationalTemperature: theta,
    rotationalConstantWavenumber: joulesToWavenumber(constant),
    partitionFunction: Math.exp(lnQ),
    symmetryTreatment: weighted ? 'nuclearSpinWeights' : 'symmetryNumber',
    symmetryNumberDivided: sigma,
    highTemperaturePartitionFunction: highTemperature,
    correctedHighTemperaturePartitionFunction: highTemperature * (1 + theta / (3 * temperature)),
    populations,
    mostPopulatedJ: js[statistics.mostPopulatedIndex]!,
    mostPopulatedJContinuous: peakJ,
    highestJ,
    molarInternalEnergy: molar.internalEnergy,
    molarEntropy: molar.entropy - GAS_CONSTANT * Math.log(sigma),
    molarHeatCapacity: molar.heatCapacity,
    units: { temperature: 'K', rotationalTemperature: 'K', rotationalConstantWavenumber: 'cm⁻¹', energyJ: 'J per particle', wavenumber: 'cm⁻¹', molarInternalEnergy: 'J/mol', molarEntropy: 'J/(mol K)', molarHeatCapacity: 'J/(mol K)' },
  }
}

export const rotationKind = {
  title: 'Rotational ladder (linear rotor)',
  description: 'Exact rotational partition function, high-temperature forms and J populations of a linear molecule.',
  version: 2,
  schema: rotationSchema,
  compute: computeRotation,
  temperatureField: 'temperature',
  exampleInput: {
    rotationalConstant: '1.9225 cm^-1',
    symmetryNumber: 1,
    temperature: '298.15 K',
  },
}

