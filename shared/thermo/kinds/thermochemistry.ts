/**
 * Kind `thermochemistry`: ideal-gas molar functions in the rigid-rotor / harmonic-oscillator model.
 * Translational (Sackur–Tetrode): S = R[ln((2πmkT/h²)^{3/2} kT/p) + 5/2], C_p = 5/2 R, H - H(0) = 5/2 RT.
 * Rotation: exact sums over rigid-rotor levels (shared/thermo/rotors.ts): linear rotors and
 * symmetric and spherical tops in closed form, asymmetric tops by diagonalising H for each J;
 * where the sum would need more J than the cost limit allows, the classical form
 * q = (√π/σ) (T³/(Θ_A Θ_B Θ_C))^{1/2} with its first quantum correction (rotors.ts). The result
 * says which was used. Nuclear-spin statistics (optional): equilibrium (one spin-weighted sum)
 * or normal (the spin modifications frozen at their high-temperature shares). Vibrations:
 * harmonic oscillators from the ground level. Electronic: explicit sum over levels.
 * (McQuarrie, Statistical Mechanics, ch. 5–8; Ochterski, "Thermochemistry in Gaussian", 2000;
 * NIST-JANAF Thermochemical Tables, 4th ed., 1998, introduction.)
 *
 * The rotational entropy is the conventional one: the nuclear-spin entropy of the
 * high-temperature limit is left out (as in the JANAF and CODATA tables), so with and without
 * spin statistics S agrees at high temperature.
 */
import { z } from 'zod'
import { AVOGADRO_CONSTANT, BOLTZMANN_CONSTANT, GAS_CONSTANT, PLANCK_CONSTANT } from '../constants'
import { boltzmannStatistics, molarFunctions } from '../numerics'
import { ROTOR_TOLERANCE, correctedClassicalTop, rotorLevels, rotorType, type RotorType } from '../rotors'
import { describeInput, quantityField, strictObject, wholeNumber } from '../schema'
import { toKilogramsPerMole, toPascal, joulesToWavenumber, messageNumber } from '../units'
import { energyField, positiveEnergyField, temperatureField } from './common'
import { harmonicFunctions } from './vibration'

const spinWeight = z
  .number({ error: (issue) => `expected a nuclear-spin weight (a number of zero or more), got ${describeInput(issue.input)}` })
  .refine((value) => Number.isFinite(value) && value >= 0, { error: 'expected a nuclear-spin weight of zero or more' })

/** Nuclear-spin weight classes: even/odd J (linear), Ka/Kc parities ee, eo, oe, oo (nonlinear). */
const LINEAR_CLASSES = ['even', 'odd'] as const
const TOP_CLASSES = ['ee', 'eo', 'oe', 'oo'] as const

const ELEMENT = /([A-Z][a-z]?)(\d*)|(\()|(\))(\d*)/g

/**
 * Number of atoms in a molecular formula such as 'H2O', 'CH3OH' or 'Ca(OH)2' (element symbols
 * with counts, parentheses for groups). Returns null when the text is not such a formula.
 */
export function atomsInFormula(formula: string): number | null {
  const text = formula.replace(/\s+/g, '')
  if (text === '' || !/^[A-Za-z0-9()]+$/.test(text)) return null
  const stack: number[] = [0]
  let consumed = 0
  for (const match of text.matchAll(ELEMENT)) {
    if (match.index !== consumed) return null
    consumed += match[0].length
    if (match[1]) stack[stack.length - 1]! += match[2] ? Number(match[2]) : 1
    else if (match[3]) stack.push(0)
    else {
      if (stack.length < 2) return null
      const group = stack.pop()! * (match[5] ? Number(match[5]) : 1)
      stack[stack.length - 1]! += group
    }
  }
  if (consumed !== text.length || stack.length !== 1 || stack[0] === 0) return null
  return stack[0]!
}

export const thermochemistrySchema = strictObject({
  molarMass: quantityField('28.0134 g/mol', (text) => toKilogramsPerMole(text, '')),
  shape: z.enum(['atom', 'linear', 'nonlinear'], { error: "expected the shape 'atom', 'linear' or 'nonlinear'" }),
  formula: z.string({ error: (issue) => `expected a molecular formula as text, such as 'H2O', got ${describeInput(issue.input)}` })
    .max(200, { error: 'a formula may have at most 200 characters' })
    .refine((text) => atomsInFormula(text) !== null, { error: "expected a molecular formula of element symbols and counts, such as 'H2O', 'CH3OH' or 'Ca(OH)2'" })
    .optional(),
  atomCount: wholeNumber('a number of atoms: a whole number of at least 1').optional(),
  rotationalConstants: z.array(positiveEnergyField, { error: 'expected a list of rotational constants' }).max(3, { error: 'expected one rotational constant (linear) or three (nonlinear)' }).optional(),
  symmetryNumber: wholeNumber('a rotational symmetry number: a whole number of at least 1').optional(),
  nuclearSpin: strictObject({
    treatment: z.enum(['equilibrium', 'normal'], { error: "expected the treatment 'equilibrium' (spin modifications interconvert) or 'normal' (frozen at the high-temperature ratio)" }),
    weights: strictObject({ even: spinWeight.optional(), odd: spinWeight.optional(), ee: spinWeight.optional(), eo: spinWeight.optional(), oe: spinWeight.optional(), oo: spinWeight.optional() }),
  }).optional(),
  vibrations: z.array(strictObject({
    wavenumber: positiveEnergyField,
    degeneracy: wholeNumber('a degeneracy: a whole number of at least 1').default(1),
  }), { error: 'expected a list of vibrations, each with a wavenumber' }).max(10_000, { error: 'expected at most 10000 vibrations' }).optional(),
  electronicLevels: z.array(strictObject({
    energy: energyField,
    degeneracy: wholeNumber('a degeneracy: a whole number of at least 1').default(1),
  }), { error: 'expected a list of electronic levels' }).max(1000, { error: 'expected at most 1000 electronic levels' }).optional(),
  temperature: temperatureField,
  pressure: quantityField('1 bar', (text) => toPascal(text, '')).default(1e5),
}).superRefine((input, context) => {
  const count = input.rotationalConstants?.length ?? 0
  if (input.shape === 'atom') {
    if (count > 0) context.addIssue({ code: 'custom', message: 'an atom has no rotational constants', path: ['rotationalConstants'] })
    if ((input.vibrations?.length ?? 0) > 0) context.addIssue({ code: 'custom', message: 'an atom has no vibrations', path: ['vibrations'] })
    if (input.nuclearSpin) context.addIssue({ code: 'custom', message: 'an atom has no rotational levels for nuclear-spin statistics', path: ['nuclearSpin'] })
  } else if (input.shape === 'linear' && count !== 1) {
    context.addIssue({ code: 'custom', message: `a linear molecule needs one rotational constant B, got ${count}`, path: ['rotationalConstants'] })
  } else if (input.shape === 'nonlinear' && count !== 3) {
    context.addIssue({ code: 'custom', message: `a nonlinear molecule needs three rotational constants A, B, C, got ${count}`, path: ['rotationalConstants'] })
  }
  if (input.formula !== undefined && input.atomCount !== undefined) {
    const atoms = atomsInFormula(input.formula)
    if (atoms !== null && atoms !== input.atomCount) context.addIssue({ code: 'custom', message: `the formula ${input.formula} has ${atoms} atoms, not ${input.atomCount}: give one or make them agree`, path: ['atomCount'] })
  }
  if (input.nuclearSpin && input.shape !== 'atom') {
    const wanted = input.shape === 'linear' ? LINEAR_CLASSES : TOP_CLASSES
    const other = input.shape === 'linear' ? TOP_CLASSES : LINEAR_CLASSES
    const weights = input.nuclearSpin.weights
    for (const key of wanted) {
      if (weights[key] === undefined) context.addIssue({ code: 'custom', message: input.shape === 'linear' ? `required: the weight of ${key}-J levels (for H₂: even 1, odd 3)` : `required: the weight of the ${key} levels (parities of Ka and Kc; for H₂O: ee 1, eo 3, oe 3, oo 1)`, path: ['nuclearSpin', 'weights', key] })
    }
    for (const key of other) {
      if (weights[key] !== undefined) context.addIssue({ code: 'custom', message: input.shape === 'linear' ? `a linear molecule's weights are for even and odd J, not '${key}'` : `a nonlinear molecule's weights are for the Ka/Kc parity classes ee, eo, oe, oo, not '${key}'`, path: ['nuclearSpin', 'weights', key] })
    }
    if (input.shape === 'nonlinear' && count === 3 && rotorType(input.rotationalConstants!.map((constant) => constant.joules)) !== 'asymmetric top') {
      context.addIssue({ code: 'custom', message: 'nuclear-spin weights are taken per Ka/Kc parity class, which describes asymmetric tops; for a symmetric or spherical top (weights by K or by J) give the symmetry number instead', path: ['nuclearSpin'] })
    }
    const values = wanted.map((key) => weights[key] ?? 0)
    if (values.every((value) => value === 0)) context.addIssue({ code: 'custom', message: 'the nuclear-spin weights cannot all be zero', path: ['nuclearSpin', 'weights'] })
    else if (values.every((value) => value === values[0])) {
      context.addIssue({ code: 'custom', message: 'equal weights for every class describe no nuclear-spin statistics: leave nuclearSpin out and give the symmetry number', path: ['nuclearSpin', 'weights'] })
    } else if (input.symmetryNumber !== undefined) {
      const implied = impliedSymmetryNumber(values)
      if (implied !== input.symmetryNumber) {
        context.addIssue({ code: 'custom', message: `the nuclear-spin weights imply σ = ${implied}, which contradicts the symmetry number ${input.symmetryNumber}: give the weights or σ, or make them agree`, path: ['symmetryNumber'] })
      }
    }
  }
})

/**
 * The symmetry number the weights imply. Linear: unequal even/odd weights, σ = 2. Nonlinear:
 * weights that depend on the parity of Ka alone (C2 about a), of Kc alone (C2 about c) or of
 * Ka + Kc (C2 about b) imply one twofold axis, σ = 2; weights depending on more imply the three
 * axes of D2, σ = 4 (Herzberg, Infrared and Raman Spectra, 1945, ch. I.3 and IV.1).
 */
function impliedSymmetryNumber(values: number[]): number {
  if (values.length === 2) return values[0] === values[1] ? 1 : 2
  const [ee, eo, oe, oo] = values as [number, number, number, number]
  if (ee === eo && oe === oo) return 2
  if (ee === oe && eo === oo) return 2
  if (ee === oo && eo === oe) return 2
  return 4
}

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

/** How the rotational contribution was computed. */
export interface RotationMethod {
  rotorType: RotorType | 'none'
  /** 'exactSum' over rigid-rotor levels, or the classical form with its first quantum correction. */
  method: 'exactSum' | 'classicalWithFirstCorrection' | 'none'
  /** The largest J in the sum (null for the classical form). */
  highestJSummed: number | null
  /** The share of the sum the levels above highestJSummed may hold at most. */
  tolerance: number
  /** For the classical form: the estimated relative size of the left-out second-order terms. */
  nextTermEstimate: number | null
  nuclearSpinTreatment: 'equilibrium' | 'normal' | 'none'
  /** The σ divided: given, or implied by the nuclear-spin weights. */
  symmetryNumber: number
}

export interface ThermochemistryResult {
  temperature: number
  pressure: number
  contributions: { translational: Contribution; rotational: Contribution; vibrational: Contribution; electronic: Contribution }
  rotation: RotationMethod
  /** Vibrational modes counted with their degeneracies, and 3N-5 or 3N-6 when N is known. */
  modeCount: { given: number; expected: number | null; atoms: number | null }
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

/** Largest J the asymmetric-top diagonalisation and the symmetric-top sum may run to (cost limit). */
const ASYMMETRIC_LIMIT_J = 100
const SYMMETRIC_LIMIT_J = 1000
const LINEAR_LIMIT_J = 1_000_000
/** −ln of the tolerance plus room for the (2J+1)² factor: J needed ≈ √(35 kT/C). */
const J_ESTIMATE_FACTOR = 35

interface RotationalPart {
  contribution: Contribution
  method: RotationMethod
}

/** Rotational molar functions: exact sums where affordable, else the corrected classical form. */
function rotationalPart(input: ThermochemistryInput, temperature: number, warnings: string[]): RotationalPart {
  const R = GAS_CONSTANT
  const kT = BOLTZMANN_CONSTANT * temperature
  const none: RotationalPart = {
    contribution: { partitionFunction: 1, entropy: 0, heatCapacityP: 0, enthalpyMinusH0: 0 },
    method: { rotorType: 'none', method: 'none', highestJSummed: null, tolerance: ROTOR_TOLERANCE, nextTermEstimate: null, nuclearSpinTreatment: 'none', symmetryNumber: 1 },
  }
  if (input.shape === 'atom') return none
  const constants = input.rotationalConstants!.map((constant) => constant.joules)
  const type = rotorType(constants)
  const classes = input.shape === 'linear' ? LINEAR_CLASSES : TOP_CLASSES
  const spin = input.nuclearSpin
  const weights = spin ? classes.map((key) => spin.weights[key]!) : classes.map(() => 1)
  const sigma = spin ? impliedSymmetryNumber(weights) : (input.symmetryNumber ?? 1)
  const meanWeight = weights.reduce((sum, weight) => sum + weight, 0) / weights.length
  const smallest = Math.min(...constants)
  const diagonalise = spin !== undefined && input.shape === 'nonlinear'
  const limit = type === 'linear' ? LINEAR_LIMIT_J : type === 'asymmetric top' || diagonalise ? ASYMMETRIC_LIMIT_J : SYMMETRIC_LIMIT_J
  const estimatedJ = Math.ceil(Math.sqrt((J_ESTIMATE_FACTOR * kT) / smallest)) + 3
  const treatment = spin?.treatment ?? 'none'
  const method: RotationMethod = { rotorType: type, method: 'exactSum', highestJSummed: null, tolerance: ROTOR_TOLERANCE, nextTermEstimate: null, nuclearSpinTreatment: treatment, symmetryNumber: sigma }

  if (estimatedJ > limit) {
    // Too many levels to sum: the classical form with its first quantum correction.
    const thetas = (type === 'linear' ? [constants[0]!] : constants).map((constant) => constant / BOLTZMANN_CONSTANT)
    const largest = Math.max(...thetas) / temperature
    method.method = 'classicalWithFirstCorrection'
    // Linear: the next term of Mulholland's series is Θ²/15T².
    method.nextTermEstimate = largest * largest / 15
    let lnQ: number, energyOverRT: number, heatCapacityOverR: number
    if (type === 'linear') {
      // q = T/(σΘ) (1 + Θ/3T + Θ²/15T²) (Mulholland 1928; McQuarrie eq. 6-42), to the first correction.
      const theta = thetas[0]!
      lnQ = Math.log(temperature / (sigma * theta)) + Math.log1p(theta / (3 * temperature))
      energyOverRT = 1 - theta / (3 * temperature + theta)
      heatCapacityOverR = 1 - (theta * theta) / ((3 * temperature + theta) * (3 * temperature + theta))
    } else {
      const top = correctedClassicalTop(thetas, sigma, temperature)
      ;({ lnQ, energyOverRT, heatCapacityOverR } = top)
      method.nextTermEstimate = top.nextTermEstimate
    }
    warnings.push(`Rotation (${type}): the exact sum would need J up to about ${estimatedJ}, beyond the limit of ${limit}; the classical partition function with its first quantum correction is used${spin ? ', and the nuclear-spin statistics are at their high-temperature limit there' : ''}. The left-out terms are of second order in Θ/T, estimated at ${messageNumber(method.nextTermEstimate, 2)} of q.`)
    return {
      contribution: { partitionFunction: Math.exp(lnQ), entropy: R * (lnQ + energyOverRT), heatCapacityP: R * heatCapacityOverR, enthalpyMinusH0: R * temperature * energyOverRT },
      method,
    }
  }

  const weightBound = Math.max(...weights) / meanWeight
  const levels = rotorLevels(constants, kT, limit, diagonalise, weightBound)
  method.highestJSummed = levels.highestJ
  if (!levels.converged) warnings.push(`Rotation: the sum stopped at the cost limit J = ${limit} before it converged; the rotational functions are truncated.`)
  let contribution: Contribution
  if (treatment !== 'normal') {
    const degeneracies = levels.degeneracies.map((degeneracy, index) => (degeneracy * weights[levels.classes[index]!]!) / meanWeight)
    const statistics = boltzmannStatistics(levels.energies, degeneracies, temperature)
    const molar = molarFunctions(statistics, temperature)
    contribution = {
      partitionFunction: Math.exp(statistics.lnPartitionFunction - Math.log(sigma)),
      entropy: molar.entropy - R * Math.log(sigma),
      heatCapacityP: molar.heatCapacity,
      enthalpyMinusH0: molar.internalEnergy,
    }
  } else {
    // Normal: each group of classes with the same weight is its own frozen species, present in its
    // high-temperature share x_G = Σ_{c∈G} w_c / Σ_c w_c; S = Σ x_G [S_G - R ln(n_G/N)] - R ln σ keeps
    // the conventional entropy (it joins the equilibrium one at high T); H(0) is each group's lowest level.
    const totalWeight = weights.reduce((sum, weight) => sum + weight, 0)
    const groups = [...new Set(weights.filter((weight) => weight > 0))]
    let entropy = 0
    let heatCapacity = 0
    let enthalpy = 0
    for (const groupWeight of groups) {
      const members = weights.map((weight, index) => (weight === groupWeight ? index : -1)).filter((index) => index >= 0)
      const energies: number[] = []
      const degeneracies: number[] = []
      levels.energies.forEach((energy, index) => {
        if (members.includes(levels.classes[index]!)) {
          energies.push(energy)
          degeneracies.push(levels.degeneracies[index]!)
        }
      })
      const share = (groupWeight * members.length) / totalWeight
      const statistics = boltzmannStatistics(energies, degeneracies, temperature)
      const molar = molarFunctions(statistics, temperature)
      entropy += share * (molar.entropy - R * Math.log(members.length / weights.length))
      heatCapacity += share * molar.heatCapacity
      enthalpy += share * AVOGADRO_CONSTANT * (statistics.meanEnergy - statistics.lowestEnergy)
    }
    entropy -= R * Math.log(sigma)
    // For a frozen mixture q is reported as exp(S/R - (H - H(0))/RT), what q is for one species.
    contribution = { partitionFunction: Math.exp(entropy / R - enthalpy / (R * temperature)), entropy, heatCapacityP: heatCapacity, enthalpyMinusH0: enthalpy }
  }
  const spinWords = treatment === 'equilibrium'
    ? `, spin-weighted (equilibrium between the nuclear-spin modifications; σ = ${sigma} implied by the weights)`
    : treatment === 'normal'
      ? `, with the nuclear-spin modifications frozen at their high-temperature shares (normal; σ = ${sigma} implied by the weights)`
      : ''
  warnings.push(`Rotation (${type}): exact sum over rigid-rotor levels up to J = ${levels.highestJ} (the levels above hold less than ${messageNumber(ROTOR_TOLERANCE, 1)} of the sum)${spinWords}.`)
  if (!spin && sigma > 1 && type === 'linear' && constants[0]! / kT > 0.1) {
    warnings.push(`The rotational temperature is not small against T (Θ_rot/T = ${messageNumber(constants[0]! / kT, 3)}): the symmetry number only approximates the nuclear-spin statistics here; give nuclearSpin (equilibrium or normal) for a homonuclear molecule such as H₂ or D₂.`)
  }
  return { contribution, method }
}

/** Ideal-gas RRHO molar functions at T and p. */
export function computeThermochemistry(input: ThermochemistryInput, warnings: string[] = []): ThermochemistryResult {
  const temperature = input.temperature
  const pressure = input.pressure
  const R = GAS_CONSTANT
  const RT = R * temperature
  const kT = BOLTZMANN_CONSTANT * temperature

  const mass = input.molarMass / AVOGADRO_CONSTANT
  const lnTranslational = 1.5 * Math.log((2 * Math.PI * mass * kT) / (PLANCK_CONSTANT * PLANCK_CONSTANT)) + Math.log(kT / pressure)
  const translational: Contribution = {
    partitionFunction: Math.exp(lnTranslational),
    entropy: R * (lnTranslational + 2.5),
    heatCapacityP: 2.5 * R,
    enthalpyMinusH0: 2.5 * RT,
  }

  const rotationalResult = rotationalPart(input, temperature, warnings)
  const rotational = rotationalResult.contribution

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

  const electronicGiven = (input.electronicLevels?.length ?? 0) > 0
  if (!electronicGiven) {
    warnings.push('Electronic: a single non-degenerate ground state is assumed (g = 1, no low-lying levels). An open-shell molecule needs its levels: a triplet ground state such as O₂ X³Σg⁻ has g = 3; a radical with a low spin-orbit level such as NO X²Π has two levels of g = 2 about 120 cm⁻¹ apart.')
  }
  const levels = electronicGiven ? input.electronicLevels! : [{ energy: { text: '0 J', joules: 0 }, degeneracy: 1 }]
  const electronicStatistics = boltzmannStatistics(levels.map((level) => level.energy.joules), levels.map((level) => level.degeneracy), temperature)
  const electronicMolar = molarFunctions(electronicStatistics, temperature)
  const electronic: Contribution = {
    partitionFunction: Math.exp(electronicStatistics.lnPartitionFunctionFromLowest),
    entropy: electronicMolar.entropy,
    heatCapacityP: electronicMolar.heatCapacity,
    enthalpyMinusH0: AVOGADRO_CONSTANT * (electronicStatistics.meanEnergy - electronicStatistics.lowestEnergy),
  }

  const givenModes = (input.vibrations ?? []).reduce((sum, vibration) => sum + vibration.degeneracy, 0)
  const atoms = input.atomCount ?? (input.formula !== undefined ? atomsInFormula(input.formula) : null)
  let expectedModes: number | null = null
  if (atoms !== null) {
    if (input.shape === 'atom' && atoms !== 1) warnings.push(`The shape is 'atom' but ${input.formula ?? 'the atom count'} gives ${atoms} atoms.`)
    if (input.shape !== 'atom' && atoms < 2) warnings.push(`A molecule needs at least two atoms; ${input.formula ?? 'the atom count'} gives ${atoms}.`)
    else if (input.shape !== 'atom') {
      // 3N - 5 modes for a linear molecule, 3N - 6 for a nonlinear one (Herzberg 1945, ch. II.1).
      expectedModes = 3 * atoms - (input.shape === 'linear' ? 5 : 6)
      if (expectedModes !== givenModes) {
        warnings.push(`Vibrational modes: ${givenModes} given (counting degeneracy), but a ${input.shape} molecule of ${atoms} atoms has 3N − ${input.shape === 'linear' ? 5 : 6} = ${expectedModes}.`)
      }
    }
  }

  const parts = [translational, rotational, vibrational, electronic]
  const entropy = parts.reduce((sum, part) => sum + part.entropy, 0)
  const heatCapacityP = parts.reduce((sum, part) => sum + part.heatCapacityP, 0)
  const enthalpy = parts.reduce((sum, part) => sum + part.enthalpyMinusH0, 0)
  return {
    temperature,
    pressure,
    contributions: { translational, rotational, vibrational, electronic },
    rotation: rotationalResult.method,
    modeCount: { given: givenModes, expected: expectedModes, atoms },
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
  version: 2,
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
