/**
 * presentResult: one calculation block as a person reads it. Labels and units come from the
 * quantity catalogue (quantities.ts), numbers from numbers.ts, drawings from shared/charts.
 */
import {
  boltzmannPlotChart, distributionChart, populationChart, sweepChart, type ChartOutput,
} from '../charts'
import {
  joulesToWavenumber, registry,
  type BoltzmannPlotResult, type LevelsResult, type MicrostatesResult, type RotationResult, type SpinResult,
  type ThermochemistryResult, type VibrationResult,
} from '../thermo'
import type { SolveTemperatureResult, SweepResult } from '../thermo/registry'
import { describeResultQuantity, parseResultPath, resultQuantityAt, type ResultPath } from './describe'
import { presentInputs } from './inputs'
import { formatFromLog10, formatInteger, formatSignificant, formatWithUncertainty, significantFigures } from './numbers'
import { MOTIONS, projectionText, type QuantityContext } from './quantities'
import type { PresentedChart, PresentedColumn, PresentedRow, PresentedSection, PresentedTable, PresentPreferences, Presentation } from './types'

/** How many levels of a level table a block, the view and the PDF list. */
export const LEVEL_TABLE_ROWS_SHOWN = 500
/** Up to how many levels a level table gets a population chart (past that it is a solid band of ink). */
export const LEVEL_TABLE_CHART_LIMIT = 5000
/** Rows of a long list shown for reading (the record and the CSV hold them all). */
const LIST_ROWS_SHOWN = 200
const WAVENUMBER = 'cm⁻¹'

const capitalise = (text: string) => text.charAt(0).toUpperCase() + text.slice(1)
const child = (value: unknown, key: string | number): unknown => (value !== null && typeof value === 'object' ? (value as Record<string | number, unknown>)[key] : undefined)
const read = (value: unknown, path: ResultPath): unknown => path.reduce(child, value)
const exactText = (value: unknown): string => (value === null || value === undefined ? '' : typeof value === 'number' ? String(value) : String(value))

/** Reads one result with its catalogue: rows, cells and columns in words and units. */
class Reader {
  readonly context: QuantityContext
  constructor(readonly kind: string, input: unknown, readonly result: unknown, readonly digits: number) {
    this.context = { input, result }
  }

  /** A number (or text) as a reader sees it, by its form in the catalogue. */
  text(value: unknown, form: string | undefined = 'real', log10?: unknown): string {
    if (value === null || value === undefined) return typeof log10 === 'number' ? formatFromLog10(log10, this.digits) : '—'
    if (form === 'text') return String(value)
    if (form === 'flag' || typeof value === 'boolean') return value ? 'yes' : 'no'
    if (form === 'integer' || form === 'exact') return formatInteger(value as number | string)
    if (typeof value === 'number') {
      if (value === 0 && typeof log10 === 'number' && Number.isFinite(log10)) return formatFromLog10(log10, this.digits)
      return formatSignificant(value, this.digits)
    }
    return String(value)
  }

  /** A row for the result value at `path`; null when the result does not hold it. */
  row(path: ResultPath, options: { uncertainty?: ResultPath, log10?: ResultPath, label?: string, value?: string, symbol?: string } = {}): PresentedRow | null {
    const found = resultQuantityAt(this.kind, path, this.context)
    const value = read(this.result, path)
    if (value === undefined && options.value === undefined) return null
    const label = options.label ?? capitalise(found ? found.quantity.label : describeResultQuantity(this.kind, path))
    const symbol = options.symbol ?? found?.quantity.symbol
    const base: PresentedRow = { key: path.map(String).join('.'), label, value: '', ...(symbol ? { symbol } : {}), ...(found?.unit ? { unit: found.unit } : {}), exact: exactText(value) }
    const uncertainty = options.uncertainty ? read(this.result, options.uncertainty) : undefined
    if (typeof value === 'number' && typeof uncertainty === 'number' && uncertainty > 0) {
      const pair = formatWithUncertainty(value, uncertainty, this.digits)
      return { ...base, value: pair.power ? `${pair.value}${pair.power}` : pair.value, uncertainty: pair.power ? `${pair.uncertainty}${pair.power}` : pair.uncertainty }
    }
    return { ...base, value: options.value ?? this.text(value, found?.quantity.form, options.log10 ? read(this.result, options.log10) : undefined) }
  }

  rows(...paths: (ResultPath | [ResultPath, Parameters<Reader['row']>[1]])[]): PresentedRow[] {
    return paths.map(item => (Array.isArray(item[0]) ? this.row(item[0] as ResultPath, item[1] as Parameters<Reader['row']>[1]) : this.row(item as ResultPath))).filter((row): row is PresentedRow => row !== null)
  }

  /** A column named by the quantity at a sample path (['levels', 0, 'fraction']). */
  column(path: ResultPath, overrides: Partial<PresentedColumn> = {}): PresentedColumn {
    const found = resultQuantityAt(this.kind, path, this.context)
    const quantity = found?.quantity
    return {
      label: capitalise(quantity?.label ?? String(path.at(-1))),
      ...(quantity?.symbol ? { symbol: quantity.symbol } : {}),
      ...(found?.unit ? { unit: found.unit } : {}),
      numeric: quantity?.form !== 'text',
      ...overrides,
    }
  }
}

function table(caption: string, name: string, columns: PresentedColumn[], cells: { shown: string[], exact: string[] }[], totalRows = cells.length): PresentedTable {
  return { caption, name, columns, rows: cells.map(cell => cell.shown), exact: cells.map(cell => cell.exact), totalRows }
}

function chart(title: string, output: ChartOutput | null): PresentedChart[] {
  return output ? [{ title, ...output }] : []
}

const cut = (count: number, shown: number, what: string) => (count > shown ? ` (the first ${shown.toLocaleString('en-US')} of ${count.toLocaleString('en-US')} ${what}; the record and the CSV hold them all)` : '')

interface Body {
  model: string
  sections: PresentedSection[]
  tables: PresentedTable[]
  charts: PresentedChart[]
  scalable: boolean
}

type Builder = (reader: Reader, options: { scale: 'linear' | 'log', size: { width: number, height: number } }) => Body

const levels: Builder = (reader, { scale, size }) => {
  const result = reader.result as LevelsResult
  const sections: PresentedSection[] = [{
    title: 'Results',
    rows: reader.rows(
      ['temperature'],
      ['partitionFunctionFromLowest'],
      [['partitionFunction'], { log10: ['log10PartitionFunction'] }],
      ['meanEnergyJ'],
      ['molarInternalEnergy'], ['molarEntropy'], ['molarHeatCapacity'],
      ['particleCount'],
      ['mostPopulated', 'fraction'],
    ).concat(result.mostPopulated ? [{ key: 'mostPopulated.index', label: 'Most populated level', value: `level ${result.mostPopulated.index + 1}${result.mostPopulated.label ? ` (${result.mostPopulated.label})` : ''}` }] : []),
  }]
  const tables: PresentedTable[] = []
  const charts: PresentedChart[] = []
  const rows = result.levels
  const levelTable = result.levelTable
  if (rows) {
    const withCounts = rows.some(level => level.count !== undefined)
    let cumulative = 0
    tables.push(table('Populations by level', 'levels-populations', [
      { label: 'Level', numeric: false },
      { label: 'Energy as typed', numeric: false },
      reader.column(['levels', 0, 'energyJ'], { label: 'Energy', unit: WAVENUMBER }),
      reader.column(['levels', 0, 'degeneracy']),
      reader.column(['levels', 0, 'fraction']),
      { label: 'Cumulative fraction', symbol: 'Σp', numeric: true },
      ...(withCounts ? [reader.column(['levels', 0, 'count'])] : []),
    ], rows.map((level, index) => {
      cumulative += level.fraction
      const name = level.label ?? `level ${index + 1}`
      const wavenumber = joulesToWavenumber(level.energyJ)
      return {
        shown: [name, level.energy, reader.text(wavenumber), String(level.degeneracy), reader.text(level.fraction, 'real', level.log10Fraction), reader.text(cumulative), ...(withCounts ? [reader.text(level.count)] : [])],
        exact: [name, level.energy, String(wavenumber), String(level.degeneracy), String(level.fraction), String(cumulative), ...(withCounts ? [exactText(level.count)] : [])],
      }
    })))
    const chartLevels = rows.map((level, index) => ({ label: level.label ?? `level ${index + 1}`, energy: joulesToWavenumber(level.energyJ), fraction: level.fraction, log10Fraction: level.log10Fraction }))
    charts.push(...chart('Populations by level', populationChart({ levels: chartLevels, energyUnit: WAVENUMBER, scale }, size)))
    if (rows.length > 1) {
      let running = 0
      const ordered = chartLevels.map(level => level).sort((left, right) => left.energy - right.energy)
      charts.push(...chart('Cumulative population', sweepChart({
        x: ordered.map(level => level.energy), xLabel: 'Energy', xUnit: WAVENUMBER, yLabel: 'Fraction at or below this energy',
        series: [{ name: 'cumulative fraction', values: ordered.map(level => (running += level.fraction)) }],
      }, size)))
    }
  } else if (levelTable) {
    const count = levelTable.energies.length
    const shown = Math.min(count, LEVEL_TABLE_ROWS_SHOWN)
    const withCounts = levelTable.counts !== undefined
    const cells = Array.from({ length: shown }, (_, index) => {
      const name = levelTable.labels?.[index] ?? `level ${index + 1}`
      const energy = Number(levelTable.energies[index])
      const degeneracy = levelTable.degeneracies ? Number(levelTable.degeneracies[index]) : 1
      const fraction = Number(levelTable.fractions[index])
      const count = withCounts ? Number(levelTable.counts![index]) : undefined
      return {
        shown: [name, reader.text(energy), String(degeneracy), reader.text(fraction, 'real', Number(levelTable.log10Fractions[index])), ...(withCounts ? [reader.text(count)] : [])],
        exact: [name, String(energy), String(degeneracy), String(fraction), ...(withCounts ? [String(count)] : [])],
      }
    })
    tables.push(table(`Populations by level${cut(count, shown, 'levels')}`, 'levels-populations', [
      { label: 'Level', numeric: false },
      reader.column(['levelTable', 'energies', 0]),
      reader.column(['levelTable', 'degeneracies', 0]),
      reader.column(['levelTable', 'fractions', 0]),
      ...(withCounts ? [reader.column(['levelTable', 'counts', 0])] : []),
    ], cells, count))
    if (count <= LEVEL_TABLE_CHART_LIMIT) {
      charts.push(...chart('Populations by level', populationChart({
        levels: Array.from({ length: count }, (_, index) => ({
          label: levelTable.labels?.[index] ?? `level ${index + 1}`, energy: Number(levelTable.energies[index]),
          fraction: Number(levelTable.fractions[index]), log10Fraction: Number(levelTable.log10Fractions[index]),
        })),
        energyUnit: levelTable.energyUnit.replace(/cm\^?-1/g, WAVENUMBER), scale, xAxis: 'energy',
      }, size)))
    }
  }
  return { model: 'Boltzmann distribution over the levels given, at thermal equilibrium.', sections, tables, charts, scalable: true }
}

const vibration: Builder = (reader, { scale, size }) => {
  const result = reader.result as VibrationResult
  const sections: PresentedSection[] = [{
    title: 'Results, all modes together',
    rows: reader.rows(['temperature'], [['partitionFunction'], { log10: ['log10PartitionFunction'] }], ['molarInternalEnergy'], ['molarEntropy'], ['molarHeatCapacity']),
  }]
  const tables: PresentedTable[] = [table('Modes', 'vibration-modes', [
    { label: 'Mode', numeric: false },
    reader.column(['modes', 0, 'wavenumber']),
    reader.column(['modes', 0, 'vibrationalTemperature']),
    reader.column(['modes', 0, 'degeneracy']),
    reader.column(['modes', 0, 'model'], { label: 'Model' }),
    reader.column(['modes', 0, 'partitionFunction'], { label: 'Partition function' }),
    reader.column(['modes', 0, 'molarEntropy']),
    reader.column(['modes', 0, 'molarHeatCapacity'], { label: 'Molar heat capacity' }),
  ], result.modes.map((mode, index) => {
    const name = mode.label ?? `mode ${index + 1}`
    return {
      shown: [name, reader.text(mode.wavenumber), reader.text(mode.vibrationalTemperature), String(mode.degeneracy), mode.model, reader.text(mode.partitionFunction, 'real', mode.log10PartitionFunction), reader.text(mode.molarEntropy), reader.text(mode.molarHeatCapacity)],
      exact: [name, String(mode.wavenumber), String(mode.vibrationalTemperature), String(mode.degeneracy), mode.model, exactText(mode.partitionFunction), String(mode.molarEntropy), String(mode.molarHeatCapacity)],
    }
  }))]
  const charts: PresentedChart[] = []
  result.modes.forEach((mode, index) => {
    const name = `mode ${index + 1}${mode.label ? ` (${mode.label})` : ''}`
    const shown = mode.populations.slice(0, LIST_ROWS_SHOWN)
    tables.push(table(`Populations of ${name}${cut(mode.populations.length, shown.length, 'levels')}`, `vibration-mode-${index + 1}-populations`, [
      reader.column(['modes', index, 'populations', 0, 'v']),
      reader.column(['modes', index, 'populations', 0, 'energyJ'], { label: 'Energy above the energy zero', unit: WAVENUMBER }),
      reader.column(['modes', index, 'populations', 0, 'fraction']),
    ], shown.map(level => ({
      shown: [String(level.v), reader.text(joulesToWavenumber(level.energyJ)), reader.text(level.fraction, 'real', level.log10Fraction)],
      exact: [String(level.v), String(joulesToWavenumber(level.energyJ)), String(level.fraction)],
    })), mode.populations.length))
    const ladder = mode.populations.slice(0, 12)
    charts.push(...chart(`Vibrational ladder of ${name}`, populationChart({
      levels: ladder.map(level => ({ label: `v = ${level.v}`, energy: joulesToWavenumber(level.energyJ), fraction: level.fraction, log10Fraction: level.log10Fraction })),
      energyUnit: WAVENUMBER, scale,
    }, size)))
  })
  if (result.modes.length > 1) {
    charts.push(...chart(`Molar entropy by mode (all modes together: ${reader.text(result.molarEntropy)} J/(mol·K))`, distributionChart({
      bars: result.modes.map((mode, index) => ({ label: mode.label ?? `mode ${index + 1}`, value: mode.molarEntropy })),
      xLabel: 'Mode', yLabel: 'Molar entropy S (J/(mol·K))',
    }, size)))
  }
  const zero = result.energyZero === 'wellBottom' ? 'energies from the bottom of the well' : 'energies from the ground state v = 0'
  return { model: `Independent oscillators, harmonic unless an anharmonicity is given (then the bound levels of the anharmonic ladder are summed); ${zero}.`, sections, tables, charts, scalable: true }
}

const rotation: Builder = (reader, { scale, size }) => {
  const result = reader.result as RotationResult
  const sections: PresentedSection[] = [{
    title: 'Results',
    rows: reader.rows(['temperature'], ['rotationalConstantWavenumber'], ['rotationalTemperature'], ['partitionFunction'], ['highTemperaturePartitionFunction'], ['correctedHighTemperaturePartitionFunction'], ['mostPopulatedJ'], ['mostPopulatedJContinuous'], ['highestJ'], ['molarInternalEnergy'], ['molarEntropy'], ['molarHeatCapacity']),
  }]
  const populations = result.populations
  const shown = populations.filter(level => level.fraction > 1e-4 || level.J <= result.mostPopulatedJ).slice(0, LIST_ROWS_SHOWN)
  const tables = [table(`Populations by J${shown.length < populations.length ? ` (levels holding more than 10⁻⁴; all ${populations.length} are in the record and the CSV)` : ''}`, 'rotation-populations', [
    reader.column(['populations', 0, 'J']),
    reader.column(['populations', 0, 'degeneracy']),
    reader.column(['populations', 0, 'wavenumber']),
    reader.column(['populations', 0, 'fraction']),
  ], shown.map(level => ({
    shown: [String(level.J), reader.text(level.degeneracy), reader.text(level.wavenumber), reader.text(level.fraction, 'real', level.log10Fraction)],
    exact: [String(level.J), String(level.degeneracy), String(level.wavenumber), String(level.fraction)],
  })), populations.length)]
  const title = `Distribution over J (most populated J = ${result.mostPopulatedJ})`
  const charts = chart(title, populationChart({
    levels: shown.slice(0, 60).map(level => ({ label: level.J === result.mostPopulatedJ ? `J = ${level.J} (most populated)` : `J = ${level.J}`, energy: level.wavenumber, fraction: level.fraction, log10Fraction: level.log10Fraction })),
    energyUnit: WAVENUMBER, scale,
  }, size))
  return { model: 'Linear rotor: E_J = B J(J+1) − D J²(J+1)², degeneracy 2J+1 times the nuclear-spin weight, divided by the symmetry number; exact sum over J.', sections, tables, charts, scalable: true }
}

const spin: Builder = (reader, { size }) => {
  const result = reader.result as SpinResult
  const sections: PresentedSection[] = [{
    title: 'Results',
    rows: reader.rows(['temperature'], ['nucleus'], ['spinQuantumNumber'], ['gyromagneticRatio'], ['field'], ['larmorFrequency'], ['zeemanSplittingJ'], ['polarization'], ['highTemperaturePolarization'], ['populationRatio']),
  }]
  const tables = [table('Zeeman levels', 'spin-levels', [
    reader.column(['levels', 0, 'm']),
    reader.column(['levels', 0, 'energyJ']),
    reader.column(['levels', 0, 'fraction']),
  ], result.levels.map(level => ({
    shown: [projectionText(level.m), reader.text(level.energyJ), reader.text(level.fraction)],
    exact: [String(level.m), String(level.energyJ), String(level.fraction)],
  })))]
  const charts = chart('Zeeman level populations', populationChart({
    levels: result.levels.map(level => ({ label: `m = ${projectionText(level.m)}`, energy: joulesToWavenumber(level.energyJ), fraction: level.fraction, log10Fraction: level.log10Fraction })),
    energyUnit: WAVENUMBER, scale: 'linear', xAxis: 'label',
  }, size))
  return { model: 'Zeeman levels E_m = −m ħγB₀ of an isolated nucleus, Boltzmann populations at the lattice temperature.', sections, tables, charts, scalable: false }
}

const microstates: Builder = (reader, { size }) => {
  const result = reader.result as MicrostatesResult
  const oscillators = result.model === 'oscillators'
  const sections: PresentedSection[] = [{
    title: 'Results',
    rows: reader.rows(['particles'], [['totalMicrostates'], { log10: ['log10TotalMicrostates'] }], ['log10TotalMicrostates'], ['distributionCount'], ['enumerationComplete'], ['boltzmannPrediction', 'temperature'], ['boltzmannPrediction', 'lnMicrostates'], ['boltzmannPrediction', 'shareOfLnTotal']),
  }]
  if (result.mostProbable) sections[0]!.rows.push({ key: 'mostProbable.occupations', label: 'Most probable distribution', value: result.mostProbable.occupations.join(' '), exact: result.mostProbable.occupations.join(' ') })
  const shown = result.distributions.slice(0, LIST_ROWS_SHOWN)
  const occupationsHeader = oscillators ? 'Oscillators holding 0, 1, 2, … quanta' : 'Particles on level 1, 2, …'
  const tables = [table(`Distributions${cut(result.distributions.length, shown.length, 'distributions')}`, 'microstates-distributions', [
    { label: occupationsHeader, symbol: 'n_i', numeric: false },
    reader.column(['distributions', 0, 'microstates'], { label: 'Number of microstates' }),
    reader.column(['distributions', 0, 'probability']),
  ], shown.map(distribution => ({
    shown: [distribution.occupations.join(' '), distribution.microstates !== null ? formatInteger(distribution.microstates) : formatFromLog10(distribution.log10Microstates, reader.digits), reader.text(distribution.probability)],
    exact: [distribution.occupations.join(' '), distribution.microstates ?? `1e${distribution.log10Microstates}`, String(distribution.probability)],
  })), result.distributions.length)]
  const charts: PresentedChart[] = []
  const bars = shown.slice(0, 40)
  if (bars.length) {
    charts.push(...chart('Probability of each distribution', distributionChart({ bars: bars.map(item => ({ label: item.occupations.join(' '), value: item.probability })), xLabel: `Distribution (${occupationsHeader.toLowerCase()})`, yLabel: 'Probability' }, size)))
  }
  const predicted = result.boltzmannPrediction.occupations
  if (predicted.length && result.mostProbable && predicted.length === result.mostProbable.occupations.length) {
    charts.push(...chart('Most probable distribution and the Boltzmann form', sweepChart({
      x: predicted.map((_, index) => (oscillators ? index : index + 1)), xLabel: oscillators ? 'Quanta held' : 'Level', xUnit: '',
      yLabel: oscillators ? 'Oscillators' : 'Particles',
      series: [{ name: 'most probable distribution', values: result.mostProbable.occupations }, { name: 'Boltzmann form', values: predicted }],
    }, size)))
  }
  return { model: oscillators ? 'Einstein solid: N distinguishable oscillators sharing Q quanta, every microstate equally likely.' : 'Distinguishable particles on the levels given, with a fixed total energy; every microstate equally likely.', sections, tables, charts, scalable: false }
}

const boltzmannPlot: Builder = (reader, { size }) => {
  const result = reader.result as BoltzmannPlotResult
  const sections: PresentedSection[] = [{
    title: 'Results',
    rows: reader.rows(
      [['temperature'], { uncertainty: ['temperatureUncertainty'] }],
      [['slope'], { uncertainty: ['slopeUncertainty'] }],
      [['intercept'], { uncertainty: ['interceptUncertainty'] }],
      ['rSquared'], ['chiSquared'], ['weighted'],
    ),
  }]
  const points = result.points
  const tables = [table('Lines, with the fit and its residuals', 'boltzmann-plot-points', [
    { label: 'Line', numeric: false },
    reader.column(['points', 0, 'upperEnergyJ'], { unit: WAVENUMBER }),
    reader.column(['points', 0, 'energyOverK']),
    reader.column(['points', 0, 'y']),
    reader.column(['points', 0, 'fitted']),
    reader.column(['points', 0, 'residual']),
  ], points.map((point, index) => {
    const name = point.label ?? `line ${index + 1}`
    return {
      shown: [name, reader.text(joulesToWavenumber(point.upperEnergyJ)), reader.text(point.energyOverK), reader.text(point.y), reader.text(point.fitted), reader.text(point.residual)],
      exact: [name, String(joulesToWavenumber(point.upperEnergyJ)), String(point.energyOverK), String(point.y), String(point.fitted), String(point.residual)],
    }
  }))]
  // The fit is in E/k (K); on a cm⁻¹ axis the slope is scaled by (E/k)/(E/hc) of any point.
  const withEnergy = points.find(point => point.energyOverK !== 0)
  const ratio = withEnergy ? withEnergy.energyOverK / joulesToWavenumber(withEnergy.upperEnergyJ) : 1
  const charts = chart('Boltzmann plot with fit and residuals', boltzmannPlotChart({
    points: points.map((point, index) => ({ energy: joulesToWavenumber(point.upperEnergyJ), y: point.y, label: point.label ?? `line ${index + 1}` })),
    fit: { slope: result.slope * ratio, intercept: result.intercept }, energyUnit: WAVENUMBER, yLabel: 'ln(I·λ/(g·A))', residuals: points.map(point => point.residual),
  }, { ...size, height: size.height + 80 }))
  return { model: `Straight line ln(I·λ/(g·A)) = −E_u/kT + b through the lines, ${result.weighted ? 'weighted by 1/σ² of each intensity' : 'unweighted (uncertainty from the scatter of the residuals)'}; assumes the upper levels are in thermal equilibrium.`, sections, tables, charts, scalable: false }
}

const thermochemistry: Builder = (reader, { size }) => {
  const result = reader.result as ThermochemistryResult
  const sections: PresentedSection[] = [{
    title: 'Standard molar functions',
    rows: reader.rows(['temperature'], ['pressure'], ['totals', 'entropy'], ['totals', 'heatCapacityP'], ['totals', 'heatCapacityV'], ['totals', 'enthalpyMinusH0'], ['totals', 'gibbsMinusH0'], ['totals', 'zeroPointEnergy']),
  }]
  const keys = Object.keys(MOTIONS) as (keyof typeof MOTIONS)[]
  const gibbs = (part: { entropy: number, enthalpyMinusH0: number }) => part.enthalpyMinusH0 - result.temperature * part.entropy
  const tables = [table('Contributions by motion', 'thermochemistry-contributions', [
    { label: 'Motion', numeric: false },
    reader.column(['contributions', 'translational', 'partitionFunction'], { label: 'Partition function' }),
    reader.column(['contributions', 'translational', 'entropy']),
    reader.column(['contributions', 'translational', 'heatCapacityP']),
    reader.column(['contributions', 'translational', 'enthalpyMinusH0']),
    reader.column(['totals', 'gibbsMinusH0']),
  ], [...keys.map(key => ({ name: capitalise(MOTIONS[key]), part: result.contributions[key] })), { name: 'Total', part: { partitionFunction: null, ...result.totals } }].map(({ name, part }) => ({
    shown: [name, part.partitionFunction === null ? '—' : reader.text(part.partitionFunction), reader.text(part.entropy), reader.text(part.heatCapacityP), reader.text(part.enthalpyMinusH0), reader.text(gibbs(part))],
    exact: [name, exactText(part.partitionFunction), String(part.entropy), String(part.heatCapacityP), String(part.enthalpyMinusH0), String(gibbs(part))],
  })))]
  const charts = chart('Standard molar entropy by motion', distributionChart({
    bars: keys.map(key => ({ label: MOTIONS[key], value: result.contributions[key].entropy })), xLabel: 'Motion', yLabel: 'S° (J/(mol·K))',
  }, size))
  return { model: 'Ideal gas, rigid rotor and harmonic oscillators (RRHO), electronic levels summed; standard state at the pressure given.', sections, tables, charts, scalable: false }
}

function sweptName(reader: Reader, output: string): string {
  const swept = child(reader.context.input, 'baseInput')
  const kind = String(child(reader.result, 'kind') ?? child(reader.context.input, 'kind'))
  const path = parseResultPath(output)
  return path ? describeResultQuantity(kind, path, swept, undefined) : output
}

const sweep: Builder = (reader, { size }) => {
  const result = reader.result as SweepResult
  const names = result.series.map(series => sweptName(reader, series.output))
  const shown = result.temperatures.slice(0, LIST_ROWS_SHOWN)
  const sections: PresentedSection[] = [{
    title: 'Results',
    rows: [
      { key: 'kind', label: 'Calculation swept', value: registry[result.kind]?.title ?? result.kind },
      { key: 'temperatures', label: 'Temperatures', value: `${formatInteger(result.temperatures.length)} points from ${reader.text(result.temperatures[0])} K to ${reader.text(result.temperatures.at(-1))} K` },
      ...result.series.map((series, index) => ({ key: `series.${index}.output`, label: `Output ${index + 1}`, value: capitalise(names[index]!), exact: series.output })),
    ],
  }]
  const tables = [table(`Values by temperature${cut(result.temperatures.length, shown.length, 'points')}`, 'sweep-points', [
    { label: 'Temperature', symbol: 'T', unit: 'K', numeric: true },
    ...names.map(name => ({ label: capitalise(name), numeric: true })),
  ], shown.map((temperature, index) => ({
    shown: [reader.text(temperature), ...result.series.map(series => reader.text(series.values[index]))],
    exact: [String(temperature), ...result.series.map(series => exactText(series.values[index]))],
  })), result.temperatures.length)]
  const logX = result.temperatures.length > 2 && Math.abs((result.temperatures[1]! / result.temperatures[0]!) - (result.temperatures[2]! / result.temperatures[1]!)) < 1e-9 && result.temperatures[1]! - result.temperatures[0]! !== result.temperatures[2]! - result.temperatures[1]!
  const charts = chart('Outputs over temperature', sweepChart({
    x: result.temperatures, xLabel: 'Temperature', xUnit: 'K', yLabel: names.length === 1 ? capitalise(names[0]!) : 'Value', logX,
    series: result.series.map((series, index) => ({ name: names[index]!, values: series.values })),
  }, size))
  return { model: `${registry[result.kind]?.title ?? result.kind}, computed afresh at each temperature of the grid.`, sections, tables, charts, scalable: false }
}

const solveTemperature: Builder = (reader) => {
  const result = reader.result as SolveTemperatureResult
  const name = capitalise(sweptName(reader, result.output))
  return {
    model: `${registry[result.kind]?.title ?? result.kind}, with the temperature found by bracketed root finding (Brent's method).`,
    sections: [{
      title: 'Results',
      rows: [
        { key: 'output', label: 'Output', value: name, exact: result.output },
        { key: 'target', label: 'Target value', value: reader.text(result.target), exact: String(result.target) },
        ...reader.rows(['temperature']),
        { key: 'value', label: 'Value of the output at that temperature', value: reader.text(result.value), exact: String(result.value) },
      ],
    }],
    tables: [],
    charts: [],
    scalable: false,
  }
}

const BUILDERS: Record<string, Builder> = { levels, vibration, rotation, spin, microstates, boltzmannPlot, thermochemistry, sweep, solveTemperature }

/**
 * One calculation block as a person reads it: inputs as typed (with the SI value used), titled
 * sections of labelled rows, tables, charts and the engine's warnings.
 */
export function presentResult(kind: string, input: unknown, result: unknown, prefs: PresentPreferences = {}, warnings: string[] = []): Presentation {
  const digits = significantFigures(prefs.significantFigures)
  const reader = new Reader(kind, input, result, digits)
  const size = { width: prefs.chartWidth ?? 640, height: prefs.chartHeight ?? 300 }
  const inputs = presentInputs(kind, input, digits)
  const build = BUILDERS[kind]
  let body: Body = { model: '', sections: [], tables: [], charts: [], scalable: false }
  if (build && result !== null && typeof result === 'object') body = build(reader, { scale: prefs.scale ?? 'linear', size })
  return {
    kind,
    title: registry[kind]?.title ?? kind,
    model: body.model,
    inputs: { title: 'Inputs, as typed', rows: inputs.rows },
    inputTables: inputs.tables,
    sections: body.sections,
    tables: body.tables,
    charts: body.charts,
    warnings,
    scalable: body.scalable,
    conventions: `Numbers to ${digits} significant figures, or rounded to their standard uncertainty; energies in tables and charts in cm⁻¹.`,
  }
}
