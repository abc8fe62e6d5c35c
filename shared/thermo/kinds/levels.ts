/**
 * Kind `levels`: Boltzmann populations of an arbitrary list of levels with degeneracies.
 * Populations p_i = g_i exp(-E_i/kT) / q, q = Σ g_i exp(-E_i/kT)
 * (McQuarrie, Statistical Mechanics, 2000, ch. 2; Atkins' Physical Chemistry, 11th ed., Topic 13B).
 */
import { z } from 'zod'
import { AVOGADRO_CONSTANT, LN10 } from '../constants'
import { FlagColumn, NumberColumn, markFinite } from '../columns'
import { boltzmannStatistics, finiteOrNull, molarFunctions } from '../numerics'
import { describeInput, labelField, quantityField, strictObject, wholeNumber } from '../schema'
import { energyFactor, toParticleCount, messageNumber } from '../units'
import { energyField, temperatureField } from './common'

const levelRow = strictObject({
  label: labelField,
  energy: energyField,
  degeneracy: wholeNumber('a degeneracy: a whole number of at least 1').default(1),
})

function isNumberList(value: unknown): value is ArrayLike<number> {
  return Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array || value instanceof Int32Array
}

/** Index of the first entry that is not a finite number, or -1 (one tight loop: zod per element would be slow at 10^6). */
function firstNonFinite(values: ArrayLike<number>, from: number): number {
  for (let index = from; index < values.length; index++) {
    const value = values[index]
    if (typeof value !== 'number' || value - value !== 0) return index
  }
  return -1
}

/** Index of the first entry that is not a whole number of at least 1, or -1. */
function firstNonDegeneracy(values: ArrayLike<number>, from: number): number {
  for (let index = from; index < values.length; index++) {
    const value = values[index]
    if (typeof value !== 'number' || !(value >= 1) || Math.floor(value) !== value || value === Infinity) return index
  }
  return -1
}

/** A long list of plain numbers (or a typed array), checked by `firstBad`; at most five bad entries are named. */
function numberColumn(what: string, firstBad: (values: ArrayLike<number>, from: number) => number) {
  return z
    .custom<ArrayLike<number>>(isNumberList, { error: (issue) => `expected a list of ${what}, got ${describeInput(issue.input)}` })
    .superRefine((values, context) => {
      let index = firstBad(values, 0)
      for (let reported = 0; index >= 0 && reported < 5; reported++) {
        context.addIssue({ code: 'custom', message: `expected ${what}, got ${describeInput(values[index])}`, path: [index] })
        index = firstBad(values, index + 1)
      }
    })
}

/** A checked energy column with its lowest and highest value, found in the same pass as the check. */
export interface EnergyColumn {
  values: ArrayLike<number>
  lowest: number
  highest: number
}

const ENERGIES_EXPECTED = 'energies as finite numbers'
const energyColumn = z
  .custom<ArrayLike<number>>(isNumberList, { error: (issue) => `expected a list of ${ENERGIES_EXPECTED}, got ${describeInput(issue.input)}` })
  .transform((values, context): EnergyColumn => {
    let lowest = Infinity
    let highest = -Infinity
    for (let index = 0; index < values.length; index++) {
      const value = values[index]
      if (typeof value !== 'number' || value - value !== 0) {
        for (let reported = 0; index >= 0 && reported < 5; reported++) {
          context.issues.push({ code: 'custom', message: `expected ${ENERGIES_EXPECTED}, got ${describeInput(values[index])}`, path: [index], input: values[index] })
          index = firstNonFinite(values, index + 1)
        }
        return z.NEVER
      }
      if (value < lowest) lowest = value
      if (value > highest) highest = value
    }
    return { values, lowest, highest }
  })

const levelTable = strictObject({
  energyUnit: quantityField("cm⁻¹", (text) => ({ text: text.trim(), factor: energyFactor(text, '') })),
  energies: energyColumn,
  degeneracies: numberColumn('degeneracies as whole numbers of at least 1', firstNonDegeneracy).optional(),
  labels: z.array(z.string({ error: 'expected a label as text' })).optional(),
})

const amountField = z
  .union([z.number(), z.string()], { error: (issue) => `expected an amount such as '1 mol' or a number of particles, got ${describeInput(issue.input)}` })
  .transform((value, context) => {
    try {
      return toParticleCount(value, '')
    } catch (error) {
      context.issues.push({ code: 'custom', message: (error as Error).message.replace(/^: /, ''), input: value })
      return z.NEVER
    }
  })

export const levelsSchema = strictObject({
  levels: z.array(levelRow, { error: 'expected a list of levels, each with an energy and a degeneracy' }).min(1, { error: 'the level list is empty: give at least one level' }).optional(),
  levelTable: levelTable.optional(),
  temperature: temperatureField,
  amount: amountField.optional(),
}).superRefine((input, context) => {
  if (input.levels === undefined && input.levelTable === undefined) {
    context.addIssue({ code: 'custom', message: 'give the levels: a list of {energy, degeneracy}', path: ['levels'] })
  }
  if (input.levels !== undefined && input.levelTable !== undefined) {
    context.addIssue({ code: 'custom', message: 'give either levels or levelTable, not both', path: ['levelTable'] })
  }
  const table = input.levelTable
  if (table) {
    const energyCount = table.energies.values.length
    if (energyCount === 0) context.addIssue({ code: 'custom', message: 'the level list is empty: give at least one energy', path: ['levelTable', 'energies'] })
    if (table.degeneracies && table.degeneracies.length !== energyCount) {
      context.addIssue({ code: 'custom', message: `expected one degeneracy per energy (${energyCount}), got ${table.degeneracies.length}`, path: ['levelTable', 'degeneracies'] })
    }
    if (table.labels && table.labels.length !== energyCount) {
      context.addIssue({ code: 'custom', message: `expected one label per energy (${energyCount}), got ${table.labels.length}`, path: ['levelTable', 'labels'] })
    }
  }
})

export type LevelsInput = z.output<typeof levelsSchema>

export interface LevelPopulation {
  label: string | null
  /** The energy as typed. */
  energy: string
  energyJ: number
  degeneracy: number
  /** Fraction of particles in the level (all its degenerate states together). */
  fraction: number
  /** log10 of the fraction; finite even where the fraction underflows to 0. */
  log10Fraction: number
  /** Expected number of particles (only with an amount). */
  count?: number
  /** True when the expected count is below one particle (only with an amount). */
  belowOneParticle?: boolean
}

/**
 * The populations of a level table as columns, one entry per level. The columns are typed arrays
 * written as plain JSON arrays (see columns.ts); energies and degeneracies echo the input, in its energy unit.
 */
export interface LevelTableResult {
  energyUnit: string
  energies: ArrayLike<number>
  degeneracies: ArrayLike<number> | null
  fractions: NumberColumn
  log10Fractions: NumberColumn
  counts?: NumberColumn
  belowOneParticle?: FlagColumn
  /** The labels as given, when the table has them. */
  labels?: string[]
}

export interface LevelsResult {
  temperature: number
  /** q with the energies as given (null if it overflows or underflows a double). */
  partitionFunction: number | null
  log10PartitionFunction: number
  /** q with the energy zero at the lowest level (≥ its degeneracy). */
  partitionFunctionFromLowest: number
  levels?: LevelPopulation[]
  levelTable?: LevelTableResult
  mostPopulated: { index: number; label: string | null; fraction: number }
  meanEnergyJ: number
  /** U = N_A <E>, J/mol, energies as given. */
  molarInternalEnergy: number
  /** S, J/(mol K). */
  molarEntropy: number
  /** C_V, J/(mol K). */
  molarHeatCapacity: number
  particleCount?: number
  units: Record<string, string>
}

const RESULT_UNITS = {
  temperature: 'K',
  energyJ: 'J per particle',
  meanEnergyJ: 'J per particle',
  molarInternalEnergy: 'J/mol',
  molarEntropy: 'J/(mol K)',
  molarHeatCapacity: 'J/(mol K)',
}

/** Populations, partition function and molar U, S, C_V of a level list at temperature T. */
export function computeLevels(input: LevelsInput, warnings: string[] = []): LevelsResult {
  const temperature = input.temperature
  const rows = input.levels
  const table = input.levelTable
  const count = rows ? rows.length : table!.energies.values.length
  let energies: ArrayLike<number>
  let degeneracies: ArrayLike<number> | null
  let scale = 1
  let range: EnergyColumn | undefined
  if (rows) {
    const energyArray = new Float64Array(count)
    const degeneracyArray = new Float64Array(count)
    for (let index = 0; index < count; index++) {
      energyArray[index] = rows[index]!.energy.joules
      degeneracyArray[index] = rows[index]!.degeneracy
    }
    energies = energyArray
    degeneracies = degeneracyArray
  } else {
    // The statistics read the input lists as they are; the result echoes them (a typed array as a column).
    energies = echoColumn(table!.energies.values)
    range = table!.energies
    degeneracies = table!.degeneracies ? echoColumn(table!.degeneracies) : null
    scale = table!.energyUnit.factor
  }
  // Level tables get result columns (typed arrays written as JSON arrays); level rows copy the
  // numbers into one object per level below.
  const fractions = table ? new NumberColumn(count) : new Float64Array(count)
  const log10Fractions = table ? new NumberColumn(count) : new Float64Array(count)
  const statistics = boltzmannStatistics(energies, degeneracies, temperature, fractions, log10Fractions, scale, range)
  const molar = molarFunctions(statistics, temperature)
  const particleCount = input.amount
  let counts: NumberColumn | undefined
  let below: FlagColumn | undefined
  let belowCount = 0
  if (particleCount !== undefined) {
    counts = new NumberColumn(count)
    below = new FlagColumn(count)
    for (let index = 0; index < count; index++) {
      const expected = fractions[index]! * particleCount
      counts[index] = expected
      if (expected < 1) {
        below[index] = 1
        belowCount++
      }
    }
    // A fraction is at most 1, so every count is finite when the fractions and the amount are.
    if (statistics.finite && Number.isFinite(particleCount)) markFinite(counts)
  }
  const underflowCount = statistics.underflowCount
  if (table && statistics.finite) {
    markFinite(fractions)
    markFinite(log10Fractions)
  }

  if (belowCount > 0) {
    warnings.push(
      `${belowCount.toLocaleString('en-US')} of ${count.toLocaleString('en-US')} level${count === 1 ? '' : 's'} ${belowCount === 1 ? 'holds' : 'hold'} fewer than one particle on average out of ${messageNumber(particleCount!, 4)}: such counts are expectation values, not whole particles.`,
    )
  }
  if (underflowCount > 0) {
    warnings.push(`${underflowCount.toLocaleString('en-US')} level${underflowCount === 1 ? ' has a population' : 's have populations'} below the smallest number a double can hold (about 1e-308): read ${underflowCount === 1 ? 'it' : 'them'} from log10Fraction.`)
  }
  const lnQ = statistics.lnPartitionFunction
  const labelAt = (index: number): string | null => (rows ? rows[index]!.label ?? null : table!.labels?.[index] ?? null)
  const result: LevelsResult = {
    temperature,
    partitionFunction: finiteOrNull(Math.exp(lnQ)) === 0 ? null : finiteOrNull(Math.exp(lnQ)),
    log10PartitionFunction: lnQ / LN10,
    partitionFunctionFromLowest: Math.exp(statistics.lnPartitionFunctionFromLowest),
    mostPopulated: { index: statistics.mostPopulatedIndex, label: labelAt(statistics.mostPopulatedIndex), fraction: fractions[statistics.mostPopulatedIndex]! },
    meanEnergyJ: statistics.meanEnergy,
    molarInternalEnergy: molar.internalEnergy,
    molarEntropy: molar.entropy,
    molarHeatCapacity: molar.heatCapacity,
    units: RESULT_UNITS,
  }
  if (result.partitionFunction === null) {
    warnings.push('The partition function with the energies as given is outside the range of a double; use log10PartitionFunction or partitionFunctionFromLowest.')
  }
  if (particleCount !== undefined) result.particleCount = particleCount
  if (rows) {
    const levels: LevelPopulation[] = new Array(count)
    for (let index = 0; index < count; index++) {
      const row = rows[index]!
      const level: LevelPopulation = {
        label: row.label ?? null,
        energy: row.energy.text,
        energyJ: row.energy.joules,
        degeneracy: row.degeneracy,
        fraction: fractions[index]!,
        log10Fraction: log10Fractions[index]!,
      }
      if (counts) {
        level.count = counts[index]!
        level.belowOneParticle = below![index] === 1
      }
      levels[index] = level
    }
    result.levels = levels
  } else {
    const tableResult: LevelTableResult = {
      energyUnit: table!.energyUnit.text,
      energies,
      degeneracies,
      fractions: fractions as NumberColumn,
      log10Fractions: log10Fractions as NumberColumn,
    }
    if (counts) {
      tableResult.counts = counts
      tableResult.belowOneParticle = below!
    }
    // Text only, so the final scan for non-finite numbers can pass over it.
    if (table!.labels) tableResult.labels = markFinite(table!.labels)
    result.levelTable = tableResult
  }
  return result
}

/**
 * An input list for the result: a plain list as given (the schema has checked every number, so
 * the final scan skips it), a typed array copied into a column so that it writes as a JSON array.
 */
function echoColumn(values: ArrayLike<number>): ArrayLike<number> {
  if (Array.isArray(values)) return markFinite(values)
  const column = new NumberColumn(values.length)
  column.set(values)
  return markFinite(column)
}

/**
 * Bulk populations for large level sets in typed arrays (charts, workers): energies in J,
 * degeneracies or null, temperature in K. Same formulas as `levels`, without a JSON result.
 */
export function levelPopulations(energies: Float64Array, degeneracies: Float64Array | null, temperature: number) {
  const fractions = new Float64Array(energies.length)
  const log10Fractions = new Float64Array(energies.length)
  const statistics = boltzmannStatistics(energies, degeneracies, temperature, fractions, log10Fractions)
  return { fractions, log10Fractions, partitionFunctionFromLowest: Math.exp(statistics.lnPartitionFunctionFromLowest), statistics }
}

export const levelsKind = {
  title: 'Level populations',
  description: 'Boltzmann populations, partition function and molar energy, entropy and heat capacity of a list of levels at one temperature.',
  version: 1,
  schema: levelsSchema,
  compute: computeLevels,
  temperatureField: 'temperature',
  exampleInput: {
    levels: [
      { label: 'v = 0 (generic CO-like ladder)', energy: '0 cm^-1', degeneracy: 1 },
      { label: 'v = 1', energy: '2143.3 cm^-1', degeneracy: 1 },
      { label: 'v = 2', energy: '4260.1 cm^-1', degeneracy: 1 },
    ],
    temperature: '298.15 K',
    amount: '1 mol',
  },
}
