/**
 * Kind `thermochemistry`: ideal-gas molar functions in the rigid-rotor / harmonic-oscillator model.
 * Translational (Sackur–Tetrode): S = R[ln((2πmkT/h²)^{3/2} kT/p) + 5/2], C_p = 5/2 R, H - H(0) = 5/2 RT.
 * Linear rotor: exact sum over J of (2J+1) e^{-BJ(J+1)/kT}, divided by σ. Nonlinear rotor:
 * q = (√π/σ) (T³/(Θ_A Θ_B Θ_C))^{1/2}, S = R(ln q + 3/2), C = 3/2 R. Vibrations: harmonic
 * oscillators from the ground level. Electronic: explicit sum over levels.
 * (McQuarrie, Statistical Mechanics, ch. 5–8; Ochterski, "Thermochemistry in Gaussian", 2000;
 * NIST-JANAF Thermochemical Tables, 4th ed., 1998, introduction.)
 */
import { z } from 'zod'
import { AVOGADRO_CONSTANT, BOLTZMANN_CONSTANT, GAS_CONSTANT, PLANCK_CONSTANT } from '../constants'
import { boltzmannStatistics, molarFunctions } from '../numerics'
import { quantityField, strictObject, wholeNumber } from '../schema'
import { toKilogramsPerMole, toPascal, joulesToWavenumber, messageNumber } from '../units'
import { energyField, positiveEnergyField, temperatureField } from './common'
import { linearRotorStatistics } from './rotation'
import { harmonicFunctions } from './vibration'

export const thermochemistrySchema = strictObject({
  molarMass: quantityField('28.0134 g/mol', (text) => toKilogramsPerMole(text, '')),
  shape: z.enum(['atom', 'linear', 'nonlinear'], { error: "expected the shape 'atom', 'linear' or 'nonlinear'" }),
  rotationalConstants: z.array(positiveEnergyField, { error: 'expected a list of rotational constants' }).max(3, { error: 'expected one rotational constant (linear) or three (nonlinear)' }).optional(),
  symmetryNumber: wholeNumber('a rotational symmetry number: a whole number of at least 1').default(1),
  vibrations: z.array(strictObject({
    wavenumber: positiveEnergyField,
    degeneracy: wholeNumber('a degeneracy: a whole number of at least 1').default(1),
  }), { error: 'expected a list of vibrations, each with a wavenumber' }).max(10_000, { error: 'expected at most 10000 vibrations' }).optional(),
  electronicLevels: z.array(strictObject({
    energy: energyField,
    degeneracy: wholeNumber('a degeneracy: a whole number of at least 1').default(1),
  }), { error: 'expected a list of electronic levels' }).min(1, { error: 'give at least the ground electronic level' }).optional(),
  temperature: temperatureField,
  pressure: quantityField('1 bar', (text) => toPascal(text, '')).default(1e5),
}).superRefine((input, context) => {
  const count = input.rotationalConstants?.length ?? 0
  if (input.shape === 'atom') {
    if (count > 0) context.addIssue({ code: 'custom', message: 'an atom has no rotational constants', path: ['rotationalConstants'] })
    if ((input.vibrations?.length ?? 0) > 0) context.addIssue({ code: 'custom', message: 'an atom has no vibrations', path: ['vibrations'] })
  } else if (input.shape === 'linear' && count !== 1) {
    context.addIssue({ code: 'custom', message: `a linear molecule needs one rotational constant B, got ${count}`, path: ['rotationalConstants'] })
  } else if (input.shape === 'nonlinear' && count !== 3) {
    context.addIssue({ code: 'custom', message: `a nonlinear molecule needs three rotational constants A, B, C, got ${count}`, path: ['rotationalConstants'] })
  }
})

export type ThermochemistryInput = z.output<typeof thermochemistrySchema>

export interface Contribution {
  partitionFunction: number | null
  /** J/(mol K). */
  entropy: number
  /** Contribution to C_p, J/(mol K). */
  heatCapacityP: number
  /** Contribution to H - H(0), J/mol. */
  enthalpyMinusH0: number
}

export interface ThermochemistryResult {
  temperature: number
  pressure: number
  contributions: { translational: Contribution; rotational: Contribution; vibrational: Contribution; electronic: Contribution }
  totals: {
    entropy: number
    heatCapacityP: number
    heatCapacityV: number
    enthalpyMinusH0: number
    gibbsMinusH0: number
    /** Harmonic zero-point energy N_A Σ g hcν̃/2, J/mol (not part of H - H(0)). */
    zeroPointEnergy: number
  }
  units: Record<string, string>
}

/** Ideal-gas RRHO molar functions at T and p. */
export function computeThermochemistry(input: ThermochemistryInput, warnings: string[] = []): ThermochemistryResult {
  const temperature = input.temperature
  const pressure = input.pressure
  const R = GAS_CONSTANT
  const RT = R * temperature
  const kT = BOLTZMANN_CONSTANT * temperature
  const sigma = input.symmetryNumber

  const mass = input.molarMass / AVOGADRO_CONSTANT
  const lnTranslational = 1.5 * Math.log((2 * Math.PI * mass * kT) / (PLANCK_CONSTANT * PLANCK_CONSTANT)) + Math.log(kT / pressure)
  const translational: Contribution = {
    partitionFunction: Math.exp(lnTranslational),
    entropy: R * (lnTranslational + 2.5),
    heatCapacityP: 2.5 * R,
    enthalpyMinusH0: 2.5 * RT,
  }

  let rotational: Contribution = { partitionFunction: 1, entropy: 0, heatCapacityP: 0, enthalpyMinusH0: 0 }
  if (input.shape === 'linear') {
    const constant = input.rotationalConstants![0]!.joules
    const statistics = linearRotorStatistics(constant, temperature)
    const molar = molarFunctions(statistics, temperature)
    rotational = {
      partitionFunction: Math.exp(statistics.lnPartitionFunction) / sigma,
      entropy: molar.entropy - R * Math.log(sigma),
      heatCapacityP: molar.heatCapacity,
      enthalpyMinusH0: molar.internalEnergy,
    }
    const ratio = constant / kT
    if (ratio > 0.1) warnings.push(`The rotational temperature is not small against T (Θ_rot/T = ${messageNumber(ratio, 3)}): the exact rigid-rotor sum is used, but nuclear-spin statistics, which the symmetry number only approximates, matter here.`)
  } else if (input.shape === 'nonlinear') {
    const thetas = input.rotationalConstants!.map((constant) => constant.joules / BOLTZMANN_CONSTANT)
    const lnQ = 0.5 * Math.log(Math.PI) - Math.log(sigma) + 0.5 * (3 * Math.log(temperature) - Math.log(thetas[0]!) - Math.log(thetas[1]!) - Math.log(thetas[2]!))
    rotational = { partitionFunction: Math.exp(lnQ), entropy: R * (lnQ + 1.5), heatCapacityP: 1.5 * R, enthalpyMinusH0: 1.5 * RT }
    const largest = Math.max(...thetas) / temperature
    if (largest > 0.05) warnings.push(`A rotational temperature is not small against T (Θ_rot/T up to ${messageNumber(largest, 3)}): the classical rotational partition function is used and loses accuracy here.`)
  }

  let vibrationalLnQ = 0
  let vibrationalS = 0
  let vibrationalC = 0
  let vibrationalU = 0
  let zeroPoint = 0
  const soft: string[] = []
  for (const vibration of input.vibrations ?? []) {
    const energy = vibration.wavenumber.joules
    const functions = harmonicFunctions(energy / kT)
    const g = vibration.degeneracy
    vibrationalLnQ += g * functions.lnQ
    vibrationalS += g * R * functions.entropyOverR
    vibrationalC += g * R * functions.heatCapacityOverR
    vibrationalU += g * RT * functions.energyOverRT
    zeroPoint += g * AVOGADRO_CONSTANT * energy * 0.5
    const wavenumber = joulesToWavenumber(energy)
    if (wavenumber < 100) soft.push(wavenumber.toPrecision(4))
  }
  if (soft.length > 0) {
    warnings.push(`Vibrations below about 100 cm⁻¹ (${soft.join(', ')} cm⁻¹) are poorly described as harmonic oscillators (they are often hindered rotations); their entropy is uncertain.`)
  }
  const vibrational: Contribution = { partitionFunction: Number.isFinite(Math.exp(vibrationalLnQ)) ? Math.exp(vibrationalLnQ) : null, entropy: vibrationalS, heatCapacityP: vibrationalC, enthalpyMinusH0: vibrationalU }

  const levels = input.electronicLevels ?? [{ energy: { text: '0 J', joules: 0 }, degeneracy: 1 }]
  const electronicStatistics = boltzmannStatistics(levels.map((level) => level.energy.joules), levels.map((level) => level.degeneracy), temperature)
  const electronicMolar = molarFunctions(electronicStatistics, temperature)
  const electronic: Contribution = {
    partitionFunction: Math.exp(electronicStatistics.lnPartitionFunctionFromLowest),
    entropy: electronicMolar.entropy,
    heatCapacityP: electronicMolar.heatCapacity,
    enthalpyMinusH0: AVOGADRO_CONSTANT * (electronicStatistics.meanEnergy - electronicStatistics.lowestEnergy),
  }

  const parts = [translational, rotational, vibrational, electronic]
  const entropy = parts.reduce((sum, part) => sum + part.entropy, 0)
  const heatCapacityP = parts.reduce((sum, part) => sum + part.heatCapacityP, 0)
  const enthalpy = parts.reduce((sum, part) => sum + part.enthalpyMinusH0, 0)
  return {
    temperature,
    pressure,
    contributions: { translational, rotational, vibrational, electronic },
    totals: {
      entropy,
      heatCapacityP,
      heatCapacityV: heatCapacityP - R,
      enthalpyMinusH0: enthalpy,
      gibbsMinusH0: enthalpy - temperature * entropy,
      zeroPointEnergy: zeroPoint,
    },
    units: { temperature: 'K', pressure: 'Pa', entropy: 'J/(mol K)', heatCapacityP: 'J/(mol K)', heatCapacityV: 'J/(mol K)', enthalpyMinusH0: 'J/mol', gibbsMinusH0: 'J/mol', zeroPointEnergy: 'J/mol' },
  }
}

export const thermochemistryKind = {
  title: 'Ideal-gas thermochemistry',
  description: 'Standard molar entropy, heat capacity, H − H(0) and G − H(0) of an ideal gas in the rigid-rotor, harmonic-oscillator model.',
  version: 1,
  schema: thermochemistrySchema,
  compute: computeThermochemistry,
  temperatureField: 'temperature',
  exampleInput: {
    molarMass: '28.0134 g/mol',
    shape: 'linear',
    rotationalConstants: ['1.98958 cm^-1'],
    symmetryNumber: 2,
    vibrations: [{ wavenumber: '2329.9 cm^-1' }],
    temperature: '298.15 K',
    pressure: '1 bar',
  },
}
