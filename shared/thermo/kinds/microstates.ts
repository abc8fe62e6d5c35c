/**
 * Kind `microstates`: counting microstates.
 * Einstein solid: N oscillators sharing Q quanta have Ω = C(Q + N - 1, Q) microstates
 * (Schroeder, An Introduction to Thermal Physics, 2000, eq. 2.9). A distribution of occupation
 * numbers {n_i} has W = N! / Π n_i! arrangements (Atkins' Physical Chemistry, Topic 13A;
 * McQuarrie, Statistical Mechanics, ch. 1). Counts are exact BigInt (as decimal strings) where
 * they fit; beyond the enumeration limit ln W of the dominant distribution comes from log-gamma.
 */
import { z } from 'zod'
import { BOLTZMANN_CONSTANT, LN10 } from '../constants'
import { binomialBig, boltzmannStatistics, log10Big, logBinomial, logFactorial, logGamma } from '../numerics'
import { strictObject, wholeNumber } from '../schema'
import { energyField } from './common'

/** At most this many distributions are listed. */
export const ENUMERATION_LIMIT = 200_000
/** Oscillator distributions are listed (dense, n_0..n_Q) only up to this many quanta. */
const MAX_ENUMERATED_QUANTA = 100_000
/** Exact W for each distribution up to this many particles. */
const EXACT_PARTICLE_LIMIT = 1000

export const microstatesSchema = strictObject({
  oscillators: strictObject({
    count: wholeNumber('a number of oscillators N: a whole number of at least 1').refine((value) => value <= 1e9, { error: 'expected at most 10^9 oscillators' }),
    quanta: wholeNumber('a number of quanta Q: a whole number of zero or more', 0).refine((value) => value <= 1e9, { error: 'expected at most 10^9 quanta' }),
  }).optional(),
  levels: strictObject({
    energies: z.array(energyField, { error: 'expected a list of level energies' }).min(1, { error: 'the level list is empty: give at least one level energy' }).max(200, { error: 'expected at most 200 levels' }),
    particles: wholeNumber('a number of particles: a whole number of at least 1').refine((value) => value <= 1e9, { error: 'expected at most 10^9 particles' }),
    totalEnergy: energyField,
  }).optional(),
}).superRefine((input, context) => {
  if ((input.oscillators === undefined) === (input.levels === undefined)) {
    context.addIssue({ code: 'custom', message: 'give either oscillators {count, quanta} or levels {energies, particles, totalEnergy}, one of the two', path: [input.oscillators === undefined ? 'oscillators' : 'levels'] })
  }
})

export type MicrostatesInput = z.output<typeof microstatesSchema>

export interface Distribution {
  /** n_i: for oscillators, how many oscillators hold i quanta (i = 0..Q); for levels, particles per level. */
  occupations: number[]
  /** W = N!/Π n_i!, exact, as a decimal string (null beyond the exact limit). */
  microstates: string | null
  log10Microstates: number
  probability: number
}

export interface MicrostatesResult {
  model: 'oscillators' | 'levels'
  particles: number
  /** Total number of microstates, exact decimal string where it fits (null when unknown). */
  totalMicrostates: string | null
  log10TotalMicrostates: number | null
  enumerationComplete: boolean
  distributionCount: number | null
  distributions: Distribution[]
  mostProbable: Distribution | null
  /** The Boltzmann (most probable, continuous) occupations and their ln W from log-gamma. */
  boltzmannPrediction: {
    occupations: number[]
    lnMicrostates: number
    /** For oscillators kT/ħω = 1/ln(1 + N/Q); for levels T in K (null when not defined). */
    temperature: number | null
    /** ln W(Boltzmann) / ln Ω(total), how much of the total the dominant distribution carries on a log scale (null when unknown). */
    shareOfLnTotal: number | null
  }
  message: string | null
}

function multinomialBig(particles: number, occupations: number[], factorials: bigint[]): bigint {
  let denominator = 1n
  for (const n of occupations) if (n > 1) denominator *= factorials[n]!
  return factorials[particles]! / denominator
}

function lnMultinomial(particles: number, occupations: ArrayLike<number>): number {
  let value = logFactorial(particles)
  for (let index = 0; index < occupations.length; index++) {
    const n = occupations[index]!
    if (n > 0) value -= Number.isInteger(n) ? logFactorial(n) : logGamma(n + 1)
  }
  return value
}

class LimitReached extends Error {}

/**
 * Number of partitions of Q into at most N parts (= parts no larger than N), counted by the
 * standard dynamic programme over part sizes (Andrews, The Theory of Partitions, ch. 1), capped
 * at cap + 1. p(k) > 200,000 for k ≥ 50, so min(Q, N) ≥ 50 exceeds the limit at once.
 */
export function partitionCount(quanta: number, particles: number, cap: number): number {
  const largestPart = Math.min(quanta, particles)
  if (largestPart >= 50 && cap < 204_226) return cap + 1
  if (largestPart >= 2 && Math.floor(quanta / 2) + 1 > cap) return cap + 1
  const ways = new Float64Array(quanta + 1)
  ways[0] = 1
  for (let part = 1; part <= largestPart; part++) {
    for (let total = part; total <= quanta; total++) {
      const value = ways[total]! + ways[total - part]!
      ways[total] = value > cap ? cap + 1 : value
    }
  }
  return ways[quanta]!
}

/** Microstate counting for the Einstein solid or for particles on given levels with a total energy. */
export function computeMicrostates(input: MicrostatesInput, warnings: string[] = []): MicrostatesResult {
  return input.oscillators ? oscillatorMicrostates(input.oscillators.count, input.oscillators.quanta, warnings) : levelMicrostates(input.levels!, warnings)
}

function finishDistributions(particles: number, raw: number[][], lnTotal: number) {
  const exact = particles <= EXACT_PARTICLE_LIMIT
  const factorials: bigint[] = []
  if (exact) {
    let value = 1n
    factorials.push(1n)
    for (let n = 1; n <= particles; n++) {
      value *= BigInt(n)
      factorials.push(value)
    }
  }
  let best: Distribution | null = null
  const distributions = raw.map((occupations) => {
    const lnW = lnMultinomial(particles, occupations)
    const distribution: Distribution = {
      occupations,
      microstates: exact ? multinomialBig(particles, occupations, factorials).toString() : null,
      log10Microstates: lnW / LN10,
      probability: Math.exp(lnW - lnTotal),
    }
    if (!best || distribution.log10Microstates > best.log10Microstates) best = distribution
    return distribution
  })
  return { distributions, mostProbable: best as Distribution | null }
}

function oscillatorMicrostates(particles: number, quanta: number, warnings: string[]): MicrostatesResult {
  const lnTotal = logBinomial(quanta + particles - 1, quanta)
  const exactTotal = Math.min(quanta, particles - 1) <= 2_000 ? binomialBig(quanta + particles - 1, quanta) : null
  // Boltzmann occupations n_j = N (1 - x) x^j with x = Q/(N + Q) (geometric distribution).
  const ratio = quanta / (particles + quanta)
  const boltzmann: number[] = []
  const reportLength = Math.min(quanta, 10_000)
  for (let j = 0; j <= reportLength; j++) boltzmann.push(particles * (1 - ratio) * Math.pow(ratio, j))
  const lnBoltzmann = lnMultinomial(particles, boltzmann)
  const raw: number[][] = []
  const count = quanta <= MAX_ENUMERATED_QUANTA ? partitionCount(quanta, particles, ENUMERATION_LIMIT) : Infinity
  const complete = count <= ENUMERATION_LIMIT
  if (complete) {
    // Partitions of Q into at most N parts, parts in non-increasing order.
    const parts: number[] = []
    const walk = (remaining: number, largest: number) => {
      if (remaining === 0) {
        const occupations = new Array<number>(quanta + 1).fill(0)
        occupations[0] = particles - parts.length
        for (const part of parts) occupations[part]!++
        raw.push(occupations)
        return
      }
      if (parts.length === particles) return
      for (let part = Math.min(remaining, largest); part >= 1; part--) {
        parts.push(part)
        walk(remaining - part, part)
        parts.pop()
      }
    }
    walk(quanta, quanta)
  }
  let message: string | null = null
  let distributions: Distribution[] = []
  let mostProbable: Distribution | null = null
  if (complete) ({ distributions, mostProbable } = finishDistributions(particles, raw, lnTotal))
  else {
    message = `${quanta > MAX_ENUMERATED_QUANTA ? `Distributions are listed only up to ${MAX_ENUMERATED_QUANTA.toLocaleString('en-US')} quanta` : `There are more than ${ENUMERATION_LIMIT.toLocaleString('en-US')} distributions of ${quanta} quanta over ${particles} oscillators`}; enumeration stopped. The dominant distribution is estimated by the Boltzmann occupations, with ln W from log-gamma.`
    warnings.push(message)
  }
  return {
    model: 'oscillators',
    particles,
    totalMicrostates: exactTotal === null ? null : exactTotal.toString(),
    log10TotalMicrostates: exactTotal === null ? lnTotal / LN10 : log10Big(exactTotal),
    enumerationComplete: complete,
    distributionCount: complete ? distributions.length : null,
    distributions,
    mostProbable,
    boltzmannPrediction: {
      occupations: boltzmann,
      lnMicrostates: lnBoltzmann,
      temperature: quanta > 0 ? 1 / Math.log(1 + particles / quanta) : 0,
      shareOfLnTotal: lnTotal > 0 ? lnBoltzmann / lnTotal : null,
    },
    message,
  }
}

function levelMicrostates(levels: NonNullable<MicrostatesInput['levels']>, warnings: string[]): MicrostatesResult {
  const particles = levels.particles
  const energies = levels.energies.map((energy) => energy.joules)
  const lowest = Math.min(...energies)
  const highest = Math.max(...energies)
  const shifted = energies.map((energy) => energy - lowest)
  const target = levels.totalEnergy.joules - particles * lowest
  const tolerance = 1e-9 * Math.max(Math.abs(levels.totalEnergy.joules), particles * Math.max(Math.abs(highest), Math.abs(lowest)), Number.MIN_VALUE)
  const order = shifted.map((_, index) => index).sort((a, b) => shifted[b]! - shifted[a]!)
  const raw: number[][] = []
  const current = new Array<number>(energies.length).fill(0)
  let complete = true
  const walk = (position: number, remainingParticles: number, remainingEnergy: number) => {
    const level = order[position]!
    const energy = shifted[level]!
    if (position === order.length - 1) {
      if (Math.abs(remainingEnergy - remainingParticles * energy) <= tolerance) {
        if (raw.length >= ENUMERATION_LIMIT) throw new LimitReached()
        current[level] = remainingParticles
        raw.push(current.slice())
        current[level] = 0
      }
      return
    }
    const most = energy > 0 ? Math.min(remainingParticles, Math.floor((remainingEnergy + tolerance) / energy)) : remainingParticles
    for (let n = most; n >= 0; n--) {
      current[level] = n
      walk(position + 1, remainingParticles - n, remainingEnergy - n * energy)
    }
    current[level] = 0
  }
  if (target < -tolerance || target > particles * (highest - lowest) + tolerance) {
    warnings.push('The total energy lies outside what the particles can hold on these levels: there are no distributions.')
  } else {
    try {
      walk(0, particles, target)
    } catch (error) {
      if (!(error instanceof LimitReached)) throw error
      complete = false
    }
  }
  // Boltzmann prediction: n_i = N e^{-βε_i}/q with β chosen so that Σ n_i ε_i = E (bisection on β).
  const meanTarget = target / particles
  const meanAt = (beta: number) => {
    const statistics = boltzmannStatistics(shifted, null, 1 / (BOLTZMANN_CONSTANT * beta))
    return statistics.meanEnergy
  }
  let occupations: number[] = []
  let temperature: number | null = null
  const spread = highest - lowest
  if (spread > 0 && meanTarget > 0 && meanTarget < spread) {
    let low = 1e-6 / spread
    let high = 1e6 / spread
    const uniformMean = shifted.reduce((sum, value) => sum + value, 0) / shifted.length
    if (meanTarget < uniformMean) {
      for (let step = 0; step < 200; step++) {
        const middle = Math.sqrt(low * high)
        if (meanAt(middle) > meanTarget) low = middle
        else high = middle
      }
      const beta = Math.sqrt(low * high)
      temperature = 1 / (BOLTZMANN_CONSTANT * beta)
      const fractions = new Float64Array(shifted.length)
      boltzmannStatistics(shifted, null, temperature, fractions)
      occupations = Array.from(fractions, (fraction) => fraction * particles)
    }
  }
  const lnBoltzmann = occupations.length > 0 ? lnMultinomial(particles, occupations) : Number.NaN
  let lnTotal = Number.NaN
  let totalString: string | null = null
  let distributions: Distribution[] = []
  let mostProbable: Distribution | null = null
  let message: string | null = null
  if (complete) {
    if (raw.length > 0) {
      let maxLn = -Infinity
      const lns = raw.map((occupation) => lnMultinomial(particles, occupation))
      for (const value of lns) maxLn = Math.max(maxLn, value)
      lnTotal = maxLn + Math.log(lns.reduce((sum, value) => sum + Math.exp(value - maxLn), 0))
    }
    ;({ distributions, mostProbable } = finishDistributions(particles, raw, lnTotal))
    if (particles <= EXACT_PARTICLE_LIMIT) {
      totalString = distributions.reduce((sum, distribution) => sum + BigInt(distribution.microstates!), 0n).toString()
    }
  } else {
    message = `There are more than ${ENUMERATION_LIMIT.toLocaleString('en-US')} distributions; enumeration stopped. The dominant distribution is estimated by the Boltzmann occupations, with ln W from log-gamma.`
    warnings.push(message)
  }
  return {
    model: 'levels',
    particles,
    totalMicrostates: totalString,
    log10TotalMicrostates: Number.isFinite(lnTotal) ? lnTotal / LN10 : totalString === '0' ? null : null,
    enumerationComplete: complete,
    distributionCount: complete ? distributions.length : null,
    distributions,
    mostProbable,
    boltzmannPrediction: {
      occupations,
      lnMicrostates: Number.isFinite(lnBoltzmann) ? lnBoltzmann : 0,
      temperature,
      shareOfLnTotal: Number.isFinite(lnTotal) && lnTotal > 0 && Number.isFinite(lnBoltzmann) ? lnBoltzmann / lnTotal : null,
    },
    message,
  }
}

export const microstatesKind = {
  title: 'Microstate count',
  description: 'Counts the ways to share energy quanta among oscillators or particles on levels, listing each distribution with its weight and probability.',
  version: 1,
  schema: microstatesSchema,
  compute: computeMicrostates,
  temperatureField: null,
  exampleInput: { oscillators: { count: 3, quanta: 4 } },
}

