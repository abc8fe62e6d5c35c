/**
 * Numerical building blocks shared by the kinds: Boltzmann statistics of a level set through
 * log-sum-exp, log-gamma, exact big-integer factorials and binomials, root finding.
 */
import { AVOGADRO_CONSTANT, BOLTZMANN_CONSTANT, GAS_CONSTANT, LN10 } from './constants'

/** Thermal statistics of a set of levels at one temperature. */
export interface LevelStatistics {
  /** ln q with energies measured from the lowest level (q' = Σ g exp(-(E - E_min)/kT)). */
  lnPartitionFunctionFromLowest: number
  /** Lowest energy in J (the shift used). */
  lowestEnergy: number
  /** ln q with energies as given: ln q' - E_min/kT. */
  lnPartitionFunction: number
  /** Mean energy per particle in J, energies as given. */
  meanEnergy: number
  /** Variance of the energy per particle in J^2. */
  energyVariance: number
  /** Index of the level with the largest population. */
  mostPopulatedIndex: number
  /** Whether every β·E_i is finite, and so every fraction and log10 fraction written is finite. */
  finite: boolean
  /** How many fractions underflowed to 0 (their log10 fractions are still finite). */
  underflowCount: number
}

/**
 * Boltzmann populations by log-sum-exp: p_i = g_i exp(-E_i/kT) / q, computed as
 * g_i exp(-(E_i - E_min)/kT) / q' so no E/kT can overflow or underflow the sum
 * (McQuarrie, Statistical Mechanics, ch. 2; the shift is the usual log-sum-exp device).
 * Writes fractions and log10 fractions into the given arrays (when given) and returns the
 * thermodynamic moments. log10 fractions are exact arithmetic in logs, so they stay finite
 * for populations far below the smallest double. Energies are multiplied by `energyScale`
 * (J per input unit) so a column in the person's unit needs no converted copy.
 */
export function boltzmannStatistics(
  energies: ArrayLike<number>,
  degeneracies: ArrayLike<number> | null,
  temperature: number,
  fractions?: Float64Array,
  log10Fractions?: Float64Array,
  energyScale = 1,
  /** The lowest and highest energy when the caller already knows them (found while checking the input). */
  range?: { lowest: number; highest: number },
): LevelStatistics {
  const count = energies.length
  const beta = energyScale / (BOLTZMANN_CONSTANT * temperature)
  // β > 0 and rounding is monotonic, so min(β·E_i) is β·E_min exactly: one pass finds both ends.
  let lowestEnergy = Infinity
  let highestEnergy = -Infinity
  if (range) {
    lowestEnergy = range.lowest
    highestEnergy = range.highest
  } else {
    for (let index = 0; index < count; index++) {
      const value = energies[index]!
      if (value < lowestEnergy) lowestEnergy = value
      if (value > highestEnergy) highestEnergy = value
    }
  }
  const lowest = beta * lowestEnergy
  const finite = Number.isFinite(lowest) && Number.isFinite(beta * highestEnergy)
  const output = fractions ?? new Float64Array(count)
  const moments = boltzmannKernel(energies, beta, degeneracies, lowest, output, log10Fractions ?? null)
  const kT = BOLTZMANN_CONSTANT * temperature
  const lowestInJoules = lowest * kT
  const lnFromLowest = Math.log(moments.sum)
  return {
    lnPartitionFunctionFromLowest: lnFromLowest,
    lowestEnergy: lowestInJoules,
    lnPartitionFunction: lnFromLowest - lowest,
    meanEnergy: lowestInJoules + moments.meanReduced * kT,
    energyVariance: moments.varianceReduced * kT * kT,
    mostPopulatedIndex: moments.mostPopulatedIndex,
    finite,
    underflowCount: moments.underflowCount,
  }
}

/** Degeneracies below this have their log10 in a table (written as a literal in the loop). */
const SMALL_LOG10_LIMIT = 4096
let smallLog10: Float64Array | null = null
/** log10 n for n = 0 … 4095 (index 0 unused: degeneracies start at 1). */
function smallLog10Table(): Float64Array {
  if (!smallLog10) {
    smallLog10 = new Float64Array(SMALL_LOG10_LIMIT)
    for (let n = 1; n < SMALL_LOG10_LIMIT; n++) smallLog10[n] = Math.log10(n)
  }
  return smallLog10
}

interface KernelMoments {
  sum: number
  firstMoment: number
  secondMoment: number
  mostPopulatedIndex: number
}

/**
 * The hot loops of boltzmannStatistics, with x_i = β·E_i − x_min (energies and degeneracies as
 * plain lists or typed arrays: the loops are as fast on either, so nothing is copied):
 * 1. e^{−x_i} alone, the only call per level, so no running total has to survive the call;
 * 2. weights w_i = g_i e^{−x_i}, their sum and first two moments, the largest, and
 *    log10 g_i − x_i/ln 10 when log10 fractions are wanted;
 * 3. fractions w_i/Σw and log10 p_i = (log10 g_i − x_i/ln 10) − log10 Σw.
 * Each pass is its own small function so each is compiled on its own, and splitting the passes
 * changes no operation and no order: the numbers are the same bits as from one fused loop.
 */
export function boltzmannKernel(
  energies: ArrayLike<number>,
  beta: number,
  degeneracies: ArrayLike<number> | null,
  lowest: number,
  fractions: Float64Array,
  log10Fractions: Float64Array | null,
): { sum: number; meanReduced: number; varianceReduced: number; mostPopulatedIndex: number; underflowCount: number } {
  exponentials(energies, beta, lowest, fractions)
  const moments = degeneracies === null
    ? momentsPlain(energies, beta, lowest, fractions, log10Fractions)
    : momentsDegenerate(energies, beta, degeneracies, lowest, fractions, log10Fractions)
  const sum = moments.sum
  const inverseSum = 1 / sum
  const underflowCount = log10Fractions === null ? normalise(fractions, inverseSum) : normaliseWithLog(fractions, inverseSum, log10Fractions, Math.log10(sum))
  const meanReduced = moments.firstMoment * inverseSum
  return {
    sum,
    meanReduced,
    varianceReduced: Math.max(0, moments.secondMoment * inverseSum - meanReduced * meanReduced),
    mostPopulatedIndex: moments.mostPopulatedIndex,
    underflowCount,
  }
}

function exponentials(energies: ArrayLike<number>, beta: number, lowest: number, out: Float64Array): void {
  const count = energies.length
  for (let index = 0; index < count; index++) out[index] = Math.exp(-(beta * energies[index]! - lowest))
}

/** Pass 2 without degeneracies (every g_i = 1, so log10 g_i = 0). */
function momentsPlain(energies: ArrayLike<number>, beta: number, lowest: number, weights: Float64Array, logs: Float64Array | null): KernelMoments {
  const inverseLn10 = 1 / LN10
  let sum = 0
  let firstMoment = 0
  let secondMoment = 0
  let largest = -1
  let mostPopulatedIndex = 0
  for (let index = 0; index < energies.length; index++) {
    const x = beta * energies[index]! - lowest
    const weight = weights[index]!
    if (logs !== null) logs[index] = -x * inverseLn10
    if (weight > largest) {
      largest = weight
      mostPopulatedIndex = index
    }
    sum += weight
    firstMoment += weight * x
    secondMoment += weight * x * x
  }
  return { sum, firstMoment, secondMoment, mostPopulatedIndex }
}

/** Pass 2 with degeneracies: whole numbers, mostly small, so their log10 comes from a table. */
function momentsDegenerate(energies: ArrayLike<number>, beta: number, degeneracies: ArrayLike<number>, lowest: number, weights: Float64Array, logs: Float64Array | null): KernelMoments {
  const table = smallLog10Table()
  const inverseLn10 = 1 / LN10
  let sum = 0
  let firstMoment = 0
  let secondMoment = 0
  let largest = -1
  let mostPopulatedIndex = 0
  for (let index = 0; index < energies.length; index++) {
    const x = beta * energies[index]! - lowest
    const degeneracy = degeneracies[index]!
    const weight = degeneracy * weights[index]!
    weights[index] = weight
    if (logs !== null) {
      const small = degeneracy | 0
      logs[index] = (small === degeneracy && small > 0 && small < 4096 ? table[small]! : Math.log10(degeneracy)) - x * inverseLn10
    }
    if (weight > largest) {
      largest = weight
      mostPopulatedIndex = index
    }
    sum += weight
    firstMoment += weight * x
    secondMoment += weight * x * x
  }
  return { sum, firstMoment, secondMoment, mostPopulatedIndex }
}

/** Normalises the weights into fractions and returns how many underflowed to 0. */
function normalise(fractions: Float64Array, inverseSum: number): number {
  let zeros = 0
  for (let index = 0; index < fractions.length; index++) {
    const fraction = fractions[index]! * inverseSum
    fractions[index] = fraction
    if (fraction === 0) zeros++
  }
  return zeros
}

/** The same, and subtracts log10 Σw from the stored log10 g_i − x_i/ln 10. */
function normaliseWithLog(fractions: Float64Array, inverseSum: number, logs: Float64Array, log10Sum: number): number {
  let zeros = 0
  for (let index = 0; index < fractions.length; index++) {
    const fraction = fractions[index]! * inverseSum
    fractions[index] = fraction
    if (fraction === 0) zeros++
    logs[index] = logs[index]! - log10Sum
  }
  return zeros
}

/** Molar thermodynamic functions of a level system (canonical ensemble of independent particles). */
export interface MolarFunctions {
  /** U = N_A <E> in J/mol, energies as given. */
  internalEnergy: number
  /** S = R ln q + U/T in J/(mol K) (invariant under an energy shift). */
  entropy: number
  /** C_V = N_A (<E²> - <E>²) / (k T²) in J/(mol K). */
  heatCapacity: number
}

/**
 * U, S and C_V of independent particles from their level statistics
 * (McQuarrie, Statistical Mechanics, eqs. 2-27 to 2-33 for distinguishable particles:
 * U = N k T² ∂ln q/∂T, S = N k ln q + U/T, C_V = (<E²> - <E>²)/(k T²)).
 */
export function molarFunctions(statistics: LevelStatistics, temperature: number): MolarFunctions {
  const internalEnergy = AVOGADRO_CONSTANT * statistics.meanEnergy
  const thermalEnergy = AVOGADRO_CONSTANT * (statistics.meanEnergy - statistics.lowestEnergy)
  return {
    internalEnergy,
    entropy: GAS_CONSTANT * statistics.lnPartitionFunctionFromLowest + thermalEnergy / temperature,
    heatCapacity: (AVOGADRO_CONSTANT * statistics.energyVariance) / (BOLTZMANN_CONSTANT * temperature * temperature),
  }
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
]

/**
 * ln Γ(x) for x > 0 by the Lanczos approximation (g = 7, n = 9; relative error about 1e-15;
 * Press et al., Numerical Recipes, 3rd ed., §6.1), with the Stirling series for large x.
 */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x)
  if (x > 15) {
    // Stirling series (Abramowitz & Stegun 6.1.41).
    const inverse = 1 / x
    const inverse2 = inverse * inverse
    return (
      (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) +
      inverse * (1 / 12 - inverse2 * (1 / 360 - inverse2 * (1 / 1260 - inverse2 / 1680)))
    )
  }
  const shifted = x - 1
  let series = LANCZOS[0]!
  const t = shifted + 7.5
  for (let index = 1; index < 9; index++) series += LANCZOS[index]! / (shifted + index)
  return 0.5 * Math.log(2 * Math.PI) + (shifted + 0.5) * Math.log(t) - t + Math.log(series)
}

const lnFactorialTable: number[] = [0]
/** ln n! (exact summation up to n = 256, log-gamma beyond). */
export function logFactorial(n: number): number {
  if (n <= 256) {
    while (lnFactorialTable.length <= n) {
      const last = lnFactorialTable.length
      lnFactorialTable.push(lnFactorialTable[last - 1]! + Math.log(last))
    }
    return lnFactorialTable[n]!
  }
  return logGamma(n + 1)
}

/** ln C(n, k) through log-factorials. */
export function logBinomial(n: number, k: number): number {
  return logFactorial(n) - logFactorial(k) - logFactorial(n - k)
}

/** Exact n! as a BigInt. */
export function factorialBig(n: number): bigint {
  let result = 1n
  for (let factor = 2n; factor <= BigInt(n); factor++) result *= factor
  return result
}

/** Exact binomial coefficient C(n, k) as a BigInt (multiplicative formula, exact at each step). */
export function binomialBig(n: number, k: number): bigint {
  if (k < 0 || k > n) return 0n
  const smaller = Math.min(k, n - k)
  let result = 1n
  for (let index = 1; index <= smaller; index++) {
    result = (result * BigInt(n - smaller + index)) / BigInt(index)
  }
  return result
}

/** log10 of a positive BigInt, accurate to double precision. */
export function log10Big(value: bigint): number {
  const text = value.toString()
  if (text.length <= 15) return Math.log10(Number(value))
  return Math.log10(Number(text.slice(0, 17)) ) + (text.length - 17)
}

/**
 * Brent's method for a bracketed root of f on [lower, upper] (Brent, Algorithms for
 * Minimization without Derivatives, 1973, ch. 4; Numerical Recipes §9.3). The caller
 * guarantees that f(lower) and f(upper) differ in sign.
 */
export function brentRoot(
  f: (x: number) => number,
  lower: number,
  upper: number,
  valueLower: number,
  valueUpper: number,
  tolerance = 1e-12,
  maxIterations = 200,
): { root: number; iterations: number } {
  let a = lower
  let b = upper
  let fa = valueLower
  let fb = valueUpper
  let c = b
  let fc = fb
  let d = b - a
  let e = d
  for (let iteration = 1; iteration <= maxIterations; iteration++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a
      fc = fa
      d = b - a
      e = d
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b
      b = c
      c = a
      fa = fb
      fb = fc
      fc = fa
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tolerance * Math.abs(b)
    const xm = 0.5 * (c - b)
    if (Math.abs(xm) <= tol1 || fb === 0) return { root: b, iterations: iteration }
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa
      let p: number
      let q: number
      if (a === c) {
        p = 2 * xm * s
        q = 1 - s
      } else {
        const qa = fa / fc
        const r = fb / fc
        p = s * (2 * xm * qa * (qa - r) - (b - a) * (r - 1))
        q = (qa - 1) * (r - 1) * (s - 1)
      }
      if (p > 0) q = -q
      p = Math.abs(p)
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d
        d = p / q
      } else {
        d = xm
        e = d
      }
    } else {
      d = xm
      e = d
    }
    a = b
    fa = fb
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1
    fb = f(b)
  }
  return { root: b, iterations: maxIterations }
}

/** A JSON-safe number: finite numbers pass, others become null. */
export function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null
}
