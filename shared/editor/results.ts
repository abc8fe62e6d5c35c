/**
 * What a calculation block shows of its result: a few headline values, tables and one chart.
 * Pure (shared/charts builds the SVG), so the editor, the read-only view and the PDF show
 * the same numbers and the same drawing.
 */
import {
  boltzmannPlotChart, distributionChart, formatFromLog10, formatNumber, populationChart, sweepChart, type ChartOutput,
} from '../charts'
import { joulesToWavenumber } from '../thermo'

export interface ResultValue { label: string, value: string, unit?: string }
export interface ResultTable { caption: string, headers: string[], rows: string[][], numeric: boolean[] }
export interface PresentedResult {
  values: ResultValue[]
  tables: ResultTable[]
  chart: ChartOutput | null
  /** Whether the chart offers a linear/logarithmic choice (population charts). */
  scalable: boolean
}

export interface PresentOptions {
  scale?: 'linear' | 'log'
  width?: number
  height?: number
  title?: string
}

/** How many levels of a level table a block, the view and the PDF list. */
export const LEVEL_TABLE_ROWS_SHOWN = 500
/** Up to how many levels a level table gets a population chart (past that it is a solid band of ink). */
export const LEVEL_TABLE_CHART_LIMIT = 5000

/** Six significant digits for the tables: what a scientist copies into a report. */
const number = (value: number | null | undefined, digits = 6) => (typeof value === 'number' && Number.isFinite(value) ? formatNumber(value, digits) : '—')
const fraction = (value: number, log10: number) => (value > 0 ? number(value) : Number.isFinite(log10) ? formatFromLog10(log10, 6) : '0')
const wavenumber = (joules: number) => number(joulesToWavenumber(joules))

function molarValues(result: { molarInternalEnergy: number, molarEntropy: number, molarHeatCapacity: number }): ResultValue[] {
  return [
    { label: 'Molar internal energy U', value: number(result.molarInternalEnergy), unit: 'J/mol' },
    { label: 'Molar entropy S', value: number(result.molarEntropy), unit: 'J/(mol K)' },
    { label: 'Molar heat capacity C_V', value: number(result.molarHeatCapacity), unit: 'J/(mol K)' },
  ]
}

/** The presentation of one evaluated block. */
export function presentResult(kind: string, result: any, options: PresentOptions = {}): PresentedResult {
  const chartOptions = { width: options.width ?? 640, height: options.height ?? 300, ...(options.title ? { title: options.title } : {}) }
  const scale = options.scale ?? 'linear'
  switch (kind) {
    case 'levels': {
      // A level table can hold 10^6 levels: the block shows the first LEVEL_TABLE_ROWS_SHOWN of
      // them in the given order (its columns may be typed arrays, so no array methods here).
      const table = result.levelTable
      const tableLength: number = table ? table.energies.length : 0
      const levels: any[] = result.levels ?? Array.from({ length: Math.min(tableLength, LEVEL_TABLE_ROWS_SHOWN) }, (_, index) => ({
        label: table.labels?.[index] ?? null, energy: `${table.energies[index]} ${table.energyUnit}`, energyJ: Number.NaN, degeneracy: table.degeneracies?.[index] ?? 1,
        fraction: table.fractions[index], log10Fraction: table.log10Fractions[index], count: table.counts?.[index],
      }))
      const withCounts = levels.some(level => level.count !== undefined)
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature), unit: 'K' },
          { label: 'Partition function q (from the lowest level)', value: number(result.partitionFunctionFromLowest) },
          ...molarValues(result),
        ],
        tables: [{
          caption: tableLength > LEVEL_TABLE_ROWS_SHOWN
            ? `Populations by level: the first ${LEVEL_TABLE_ROWS_SHOWN} of ${tableLength.toLocaleString('en-US')} levels (the result holds every level)`
            : 'Populations by level',
          headers: ['Level', 'Energy', 'g', 'Fraction', ...(withCounts ? ['Particles'] : [])],
          numeric: [false, true, true, true, true],
          rows: levels.map((level, index) => [
            level.label ?? `level ${index + 1}`, level.energy, String(level.degeneracy), fraction(level.fraction, level.log10Fraction),
            ...(withCounts ? [number(level.count)] : []),
          ]),
        }],
        chart: result.levels
          ? populationChart({
              levels: levels.map((level, index) => ({ label: level.label ?? `level ${index + 1}`, energy: joulesToWavenumber(level.energyJ), fraction: level.fraction, log10Fraction: level.log10Fraction })),
              energyUnit: 'cm⁻¹', scale,
            }, chartOptions)
          : table && tableLength <= LEVEL_TABLE_CHART_LIMIT
            ? populationChart({
                // Every level of the table, along its energy axis (as the record PDF draws it).
                levels: Array.from({ length: tableLength }, (_, index) => ({
                  label: table.labels?.[index] ?? `level ${index + 1}`, energy: Number(table.energies[index]),
                  fraction: Number(table.fractions[index]), log10Fraction: Number(table.log10Fractions[index]),
                })),
                energyUnit: String(table.energyUnit), scale, xAxis: 'energy',
              }, chartOptions)
            : null,
        scalable: true,
      }
    }
    case 'vibration': {
      const modes: any[] = result.modes
      const first = modes[0]
      const shown = first ? first.populations.slice(0, 12) : []
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature), unit: 'K' },
          { label: 'Partition function q (all modes)', value: result.partitionFunction === null ? formatFromLog10(result.log10PartitionFunction, 6) : number(result.partitionFunction) },
          ...molarValues(result),
        ],
        tables: [
          {
            caption: 'Modes',
            headers: ['Mode', 'ω (cm⁻¹)', 'Θ_vib (K)', 'g', 'Model', 'q'],
            numeric: [false, true, true, true, false, true],
            rows: modes.map((mode, index) => [mode.label ?? `mode ${index + 1}`, number(mode.wavenumber), number(mode.vibrationalTemperature), String(mode.degeneracy), mode.model, number(mode.partitionFunction)]),
          },
          {
            caption: `Populations of ${first?.label ?? 'the first mode'}`,
            headers: ['v', 'Energy (cm⁻¹)', 'Fraction'],
            numeric: [true, true, true],
            rows: shown.map((level: any) => [String(level.v), wavenumber(level.energyJ), fraction(level.fraction, level.log10Fraction)]),
          },
        ],
        chart: first
          ? populationChart({ levels: shown.map((level: any) => ({ label: `v = ${level.v}`, energy: joulesToWavenumber(level.energyJ), fraction: level.fraction, log10Fraction: level.log10Fraction })), energyUnit: 'cm⁻¹', scale }, chartOptions)
          : null,
        scalable: true,
      }
    }
    case 'rotation': {
      const populations: any[] = result.populations
      const shown = populations.filter(level => level.fraction > 1e-4 || level.J <= result.mostPopulatedJ).slice(0, 60)
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature), unit: 'K' },
          { label: 'Rotational temperature Θ_rot', value: number(result.rotationalTemperature), unit: 'K' },
          { label: 'Partition function q (exact sum)', value: number(result.partitionFunction) },
          { label: 'High-temperature q', value: number(result.highTemperaturePartitionFunction) },
          { label: 'Most populated J', value: String(result.mostPopulatedJ) },
          ...molarValues(result),
        ],
        tables: [{
          caption: 'Populations by J',
          headers: ['J', 'Degeneracy', 'Energy (cm⁻¹)', 'Fraction'],
          numeric: [true, true, true, true],
          rows: shown.map(level => [String(level.J), number(level.degeneracy), number(level.wavenumber), fraction(level.fraction, level.log10Fraction)]),
        }],
        chart: populationChart({ levels: shown.map(level => ({ label: `J = ${level.J}`, energy: level.wavenumber, fraction: level.fraction, log10Fraction: level.log10Fraction })), energyUnit: 'cm⁻¹', scale }, chartOptions),
        scalable: true,
      }
    }
    case 'spin': {
      const levels: any[] = result.levels
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature), unit: 'K' },
          { label: 'Field B₀', value: number(result.field), unit: 'T' },
          { label: 'Larmor frequency', value: number(result.larmorFrequency / 1e6), unit: 'MHz' },
          { label: 'Polarization P', value: number(result.polarization) },
          { label: 'High-temperature P', value: number(result.highTemperaturePolarization) },
          { label: 'Population ratio (lower/upper)', value: number(result.populationRatio, 9) },
        ],
        tables: [{
          caption: 'Zeeman levels',
          headers: ['m', 'Energy (J)', 'Fraction'],
          numeric: [true, true, true],
          rows: levels.map(level => [String(level.m), number(level.energyJ), number(level.fraction, 9)]),
        }],
        chart: populationChart({ levels: levels.map(level => ({ label: `m = ${level.m}`, energy: joulesToWavenumber(level.energyJ), fraction: level.fraction, log10Fraction: level.log10Fraction })), energyUnit: 'cm⁻¹', scale, xAxis: 'label' }, chartOptions),
        scalable: false,
      }
    }
    case 'microstates': {
      const distributions: any[] = result.distributions ?? []
      const shown = distributions.slice(0, 40)
      const label = (occupations: number[]) => occupations.map(value => formatNumber(value, 3)).join(' ')
      return {
        values: [
          { label: 'Particles', value: String(result.particles) },
          { label: 'Total microstates W', value: result.totalMicrostates ?? (result.log10TotalMicrostates === null ? '—' : formatFromLog10(result.log10TotalMicrostates, 6)) },
          { label: 'Distributions', value: result.distributionCount === null ? 'more than listed' : String(result.distributionCount) },
        ],
        tables: [{
          caption: 'Distributions',
          headers: ['Occupations', 'Microstates W', 'Probability'],
          numeric: [false, true, true],
          rows: shown.map(distribution => [label(distribution.occupations), distribution.microstates ?? formatFromLog10(distribution.log10Microstates, 6), number(distribution.probability)]),
        }],
        chart: shown.length > 0
          ? distributionChart({ bars: shown.map(distribution => ({ label: label(distribution.occupations), value: distribution.probability })), xLabel: 'Distribution (n₀ n₁ …)', yLabel: 'Probability' }, chartOptions)
          : null,
        scalable: false,
      }
    }
    case 'boltzmannPlot': {
      const points: any[] = result.points
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature), unit: 'K' },
          { label: 'Standard uncertainty of T', value: number(result.temperatureUncertainty), unit: 'K' },
          { label: 'R²', value: number(result.rSquared) },
          { label: 'Fit', value: result.weighted ? 'weighted by 1/σ²' : 'unweighted' },
        ],
        tables: [{
          caption: 'Lines',
          headers: ['Line', 'E upper (cm⁻¹)', 'ln(I/gA)', 'Fitted', 'Residual'],
          numeric: [false, true, true, true, true],
          rows: points.map((point, index) => [point.label ?? `line ${index + 1}`, wavenumber(point.upperEnergyJ), number(point.y), number(point.fitted), number(point.residual, 3)]),
        }],
        chart: boltzmannPlotChart({
          // The fit is in E/k (K); on a cm⁻¹ axis the slope is scaled by hc/k.
          points: points.map((point, index) => ({ energy: joulesToWavenumber(point.upperEnergyJ), y: point.y, label: point.label ?? `line ${index + 1}` })),
          fit: { slope: result.slope * (point0Ratio(points)), intercept: result.intercept },
          energyUnit: 'cm⁻¹', yLabel: 'ln(I/gA)', residuals: points.map(point => point.residual),
        }, { ...chartOptions, height: (chartOptions.height ?? 300) + 80 }),
        scalable: false,
      }
    }
    case 'thermochemistry': {
      const parts = ['translational', 'rotational', 'vibrational', 'electronic'] as const
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature), unit: 'K' },
          { label: 'Pressure', value: number(result.pressure), unit: 'Pa' },
          { label: 'Entropy S°', value: number(result.totals.entropy), unit: 'J/(mol K)' },
          { label: 'Heat capacity C_p', value: number(result.totals.heatCapacityP), unit: 'J/(mol K)' },
          { label: 'H − H(0)', value: number(result.totals.enthalpyMinusH0), unit: 'J/mol' },
          { label: 'G − H(0)', value: number(result.totals.gibbsMinusH0), unit: 'J/mol' },
        ],
        tables: [{
          caption: 'Contributions',
          headers: ['Motion', 'q', 'S (J/(mol K))', 'C_p (J/(mol K))', 'H − H(0) (J/mol)'],
          numeric: [false, true, true, true, true],
          rows: parts.map(part => [part, number(result.contributions[part].partitionFunction), number(result.contributions[part].entropy), number(result.contributions[part].heatCapacityP), number(result.contributions[part].enthalpyMinusH0)]),
        }],
        chart: null,
        scalable: false,
      }
    }
    case 'sweep': {
      const series: any[] = result.series
      return {
        values: [{ label: 'Points', value: String(result.temperatures.length) }],
        tables: [{
          caption: 'Values by temperature',
          headers: ['T (K)', ...series.map(item => item.output)],
          numeric: [true, ...series.map(() => true)],
          rows: result.temperatures.slice(0, 200).map((temperature: number, index: number) => [number(temperature), ...series.map(item => number(item.values[index]))]),
        }],
        chart: sweepChart({ x: result.temperatures, xLabel: 'Temperature', xUnit: 'K', yLabel: series.length === 1 ? series[0].output : 'Value', series: series.map(item => ({ name: item.output, values: item.values })) }, chartOptions),
        scalable: false,
      }
    }
    case 'solveTemperature':
      return {
        values: [
          { label: 'Temperature', value: number(result.temperature, 8), unit: 'K' },
          { label: `${result.output} there`, value: number(result.value, 8) },
          { label: 'Iterations', value: String(result.iterations) },
        ],
        tables: [],
        chart: null,
        scalable: false,
      }
    default:
      return { values: [], tables: [], chart: null, scalable: false }
  }
}

/** cm⁻¹ per (E/k in K): the Boltzmann-plot slope is per kelvin of E/k; the axis is in cm⁻¹. */
function point0Ratio(points: { upperEnergyJ: number, energyOverK: number }[]): number {
  const point = points.find(item => item.energyOverK !== 0)
  return point ? point.energyOverK / joulesToWavenumber(point.upperEnergyJ) : 1
}
