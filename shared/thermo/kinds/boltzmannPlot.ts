/**
 * Kind `boltzmannPlot`: temperature from line intensities. For lines from a thermal population,
 * ln(I λ / (g A)) = -E_upper/(kT) + constant (the Boltzmann-plot method; Griem, Principles of
 * Plasma Spectroscopy, 1997, §6.2). Straight line by weighted least squares
 * (Bevington & Robinson, Data Reduction and Error Analysis, 3rd ed., ch. 6; Numerical Recipes §15.2):
 * weights 1/σ_y² with σ_y = σ_I / I when uncertainties are given, else equal weights and the
 * scatter of the residuals for the uncertainty.
 */
import { z } from 'zod'
import { BOLTZMANN_CONSTANT } from '../constants'
import { describeInput, labelField, strictObject } from '../schema'
import { inputError } from '../errors'
import { energyField } from './common'
import { messageNumber } from '../units'

function positive(what: string) {
  return z
    .number({ error: (issue) => (issue.input === undefined ? `required: ${what}` : `expected ${what}, got ${describeInput(issue.input)}`) })
    .refine((value) => Number.isFinite(value) && value > 0, { error: (issue) => `expected ${what} above zero, got ${describeInput(issue.input)}` })
}

const lineSchema = strictObject({
  label: labelField,
  upperEnergy: energyField,
  degeneracy: positive('the upper-level degeneracy g'),
  intensity: positive('a measured intensity'),
  lineStrength: positive('a line strength (for example A or A·ν)').optional(),
  wavelengthFactor: positive('a wavelength factor (for example λ)').optional(),
  uncertainty: positive('the standard uncertainty of the intensity').optional(),
})

export const boltzmannPlotSchema = strictObject({
  lines: z.array(lineSchema, { error: 'expected a list of measured lines' }).min(2, { error: 'give at least two lines' }).max(100_000, { error: 'expected at most 100000 lines' }),
})

export type BoltzmannPlotInput = z.output<typeof boltzmannPlotSchema>

export interface BoltzmannPlotResult {
  /** T = -1/slope, K (null if the slope is not negative). */
  temperature: number | null
  temperatureUncertainty: number | null
  /** Slope of y against E/k, K^-1. */
  slope: number
  slopeUncertainty: number | null
  intercept: number
  interceptUncertainty: number | null
  rSquared: number | null
  chiSquared: number | null
  weighted: boolean
  points: { label: string | null; upperEnergyJ: number; energyOverK: number; y: number; fitted: number; residual: number }[]
  units: Record<string, string>
}

/** Weighted least-squares Boltzmann plot. */
export function computeBoltzmannPlot(input: BoltzmannPlotInput, warnings: string[] = []): BoltzmannPlotResult {
  const lines = input.lines
  const withUncertainty = lines.filter((line) => line.uncertainty !== undefined).length
  if (withUncertainty > 0 && withUncertainty < lines.length) {
    const missing = lines.findIndex((line) => line.uncertainty === undefined)
    inputError(`lines[${missing}].uncertainty`, 'give an intensity uncertainty for every line or for none')
  }
  const weighted = withUncertainty === lines.length
  const x = lines.map((line) => line.upperEnergy.joules / BOLTZMANN_CONSTANT)
  const distinct = new Set(x.map((value) => value.toPrecision(12)))
  if (distinct.size < 2) inputError('lines', 'the lines need at least two different upper-level energies')
  const y = lines.map((line) => Math.log((line.intensity * (line.wavelengthFactor ?? 1)) / (line.degeneracy * (line.lineStrength ?? 1))))
  const w = lines.map((line) => (weighted ? (line.intensity / line.uncertainty!) ** 2 : 1))
  let S = 0
  let Sx = 0
  let Sy = 0
  for (let index = 0; index < x.length; index++) {
    S += w[index]!
    Sx += w[index]! * x[index]!
    Sy += w[index]! * y[index]!
  }
  const meanX = Sx / S
  const meanY = Sy / S
  let Stt = 0
  let slopeSum = 0
  for (let index = 0; index < x.length; index++) {
    const t = x[index]! - meanX
    Stt += w[index]! * t * t
    slopeSum += w[index]! * t * y[index]!
  }
  const slope = slopeSum / Stt
  const intercept = meanY - slope * meanX
  let chiSquared = 0
  let totalSquares = 0
  const points = lines.map((line, index) => {
    const fitted = intercept + slope * x[index]!
    const residual = y[index]! - fitted
    chiSquared += w[index]! * residual * residual
    totalSquares += w[index]! * (y[index]! - meanY) ** 2
    return { label: line.label ?? null, upperEnergyJ: line.upperEnergy.joules, energyOverK: x[index]!, y: y[index]!, fitted, residual }
  })
  const degreesOfFreedom = lines.length - 2
  let slopeVariance: number | null
  let interceptVariance: number | null
  if (weighted) {
    slopeVariance = 1 / Stt
    interceptVariance = (1 / S) * (1 + (S * meanX * meanX) / Stt)
  } else if (degreesOfFreedom > 0) {
    const scatter = chiSquared / degreesOfFreedom
    slopeVariance = scatter / Stt
    interceptVariance = scatter * (1 / S + (meanX * meanX) / Stt)
  } else {
    slopeVariance = null
    interceptVariance = null
    warnings.push('Two lines without intensity uncertainties fix the line exactly: no uncertainty can be given. Add lines or uncertainties.')
  }
  if (weighted && degreesOfFreedom > 0 && chiSquared / degreesOfFreedom > 4) {
    warnings.push(`The scatter about the line is larger than the stated uncertainties allow (χ²/ν = ${messageNumber(chiSquared / degreesOfFreedom, 3)}); the temperature uncertainty is likely too small.`)
  }
  let temperature: number | null = null
  let temperatureUncertainty: number | null = null
  if (slope < 0) {
    temperature = -1 / slope
    temperatureUncertainty = slopeVariance === null ? null : Math.sqrt(slopeVariance) / (slope * slope)
  } else {
    warnings.push('The intensities do not fall with upper-level energy (the slope is not negative): no positive temperature describes these lines.')
  }
  return {
    temperature,
    temperatureUncertainty,
    slope,
    slopeUncertainty: slopeVariance === null ? null : Math.sqrt(slopeVariance),
    intercept,
    interceptUncertainty: interceptVariance === null ? null : Math.sqrt(interceptVariance),
    rSquared: totalSquares > 0 ? 1 - chiSquared / totalSquares : null,
    chiSquared: weighted ? chiSquared : null,
    weighted,
    points,
    units: { temperature: 'K', slope: 'K^-1', energyOverK: 'K', upperEnergyJ: 'J', y: 'ln(I·λ/(g·A)), dimensionless' },
  }
}

export const boltzmannPlotKind = {
  title: 'Boltzmann plot',
  description: 'Temperature, with its standard uncertainty, from the intensities of lines with known upper-level energies and degeneracies.',
  version: 1,
  schema: boltzmannPlotSchema,
  compute: computeBoltzmannPlot,
  temperatureField: null,
  exampleInput: {
    lines: [
      { label: 'line 1 (illustrative values)', upperEnergy: '1000 cm^-1', degeneracy: 3, intensity: 1.0 },
      { label: 'line 2', upperEnergy: '2000 cm^-1', degeneracy: 5, intensity: 0.13 },
      { label: 'line 3', upperEnergy: '3000 cm^-1', degeneracy: 7, intensity: 0.017 },
    ],
  },
}
