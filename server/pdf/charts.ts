// The chart of a calculation block in the PDF: the same shared/charts geometry the entry page
// draws, fed from the server-computed result stored in the signed record.
import {
  boltzmannPlotChart,
  distributionChart,
  populationChart,
  sweepChart,
  type ChartOutput,
} from '../../shared/charts'
import { LEVEL_TABLE_CHART_LIMIT } from '../../shared/editor/results'
import type { Calculation } from '../../shared/records'

const BOLTZMANN_CONSTANT = 1.380649e-23 // J/K, exact (CODATA 2018 / SI 2019)
const JOULES_PER_WAVENUMBER = 1.986445857e-23 // hc in J per cm⁻¹ (CODATA 2018, exact h and c)

const size = { width: 640, height: 300 }
type AnyRecord = Record<string, any>
const isArray = (value: unknown): value is any[] => Array.isArray(value)

function levelsChart(result: AnyRecord, title: string): ChartOutput | null {
  if (isArray(result.levels)) {
    const levels = result.levels.map((level: AnyRecord, index: number) => ({
      label: String(level.label ?? `level ${index}`),
      energy: Number(level.energyJ) / JOULES_PER_WAVENUMBER,
      fraction: Number(level.fraction),
      log10Fraction: Number(level.log10Fraction),
    }))
    const smallest = Math.min(...levels.map((level: { log10Fraction: number }) => level.log10Fraction))
    return populationChart({ levels, energyUnit: 'cm⁻¹', scale: smallest < -3 ? 'log' : 'linear' }, { ...size, title })
  }
  const table = result.levelTable as AnyRecord | undefined
  // Past a few thousand levels a population chart is a solid band of ink: the table lists the
  // first levels and the record holds them all.
  if (table && isArray(table.energies) && table.energies.length <= LEVEL_TABLE_CHART_LIMIT) {
    const levels = table.energies.map((energy: number, index: number) => ({
      label: isArray(table.labels) ? String(table.labels[index]) : `level ${index + 1}`,
      energy,
      fraction: Number(table.fractions?.[index]),
      log10Fraction: Number(table.log10Fractions?.[index]),
    }))
    return populationChart({ levels, energyUnit: String(table.energyUnit ?? ''), scale: 'log', xAxis: 'energy' }, { ...size, title })
  }
  return null
}

function rotationChart(result: AnyRecord, title: string): ChartOutput | null {
  if (!isArray(result.populations)) return null
  const levels = result.populations.map((level: AnyRecord) => ({
    label: `J = ${level.J}`,
    energy: Number(level.wavenumber),
    fraction: Number(level.fraction),
    log10Fraction: Number(level.log10Fraction),
  }))
  return populationChart({ levels, energyUnit: 'cm⁻¹', scale: 'linear' }, { ...size, title })
}

function spinChart(result: AnyRecord, title: string): ChartOutput | null {
  if (!isArray(result.levels)) return null
  const levels = result.levels.map((level: AnyRecord) => ({
    label: `m = ${level.m}`,
    energy: Number(level.energyJ) / BOLTZMANN_CONSTANT / Number(result.temperature || 1),
    fraction: Number(level.fraction),
    log10Fraction: Number(level.log10Fraction),
  }))
  return populationChart({ levels, energyUnit: 'kT', scale: 'linear', xAxis: 'label' }, { ...size, title })
}

function boltzmannChart(result: AnyRecord, title: string): ChartOutput | null {
  if (!isArray(result.points)) return null
  const points = result.points.map((point: AnyRecord) => ({
    energy: Number(point.upperEnergyJ) / JOULES_PER_WAVENUMBER,
    y: Number(point.y),
    ...(point.label ? { label: String(point.label) } : {}),
  }))
  // The engine's slope is per (E/k) in kelvin; per cm⁻¹ it is scaled by hc/k.
  const slope = Number(result.slope) * (JOULES_PER_WAVENUMBER / BOLTZMANN_CONSTANT)
  return boltzmannPlotChart({
    points,
    fit: { slope, intercept: Number(result.intercept) },
    energyUnit: 'cm⁻¹',
    yLabel: 'ln(I/gA)',
    residuals: result.points.map((point: AnyRecord) => Number(point.residual)),
  }, { ...size, title })
}

function microstatesChart(result: AnyRecord, title: string): ChartOutput | null {
  if (!isArray(result.distributions) || result.distributions.length === 0) return null
  const bars = result.distributions.slice(0, 40).map((distribution: AnyRecord) => ({
    label: isArray(distribution.occupations) ? distribution.occupations.join(' ') : '',
    value: distribution.microstates !== null ? Number(distribution.microstates) : 10 ** Number(distribution.log10Microstates),
  }))
  return distributionChart({ bars, xLabel: 'Distribution (occupation numbers)', yLabel: 'Microstates W' }, { ...size, title })
}

function sweepChartOf(result: AnyRecord, title: string): ChartOutput | null {
  if (!isArray(result.temperatures) || !isArray(result.series)) return null
  return sweepChart({
    x: result.temperatures.map(Number),
    xLabel: 'Temperature',
    xUnit: 'K',
    yLabel: result.series.length === 1 ? String(result.series[0].output) : 'Output',
    series: result.series.map((series: AnyRecord) => ({ name: String(series.output), values: series.values })),
  }, { ...size, title })
}

const builders: Record<string, (result: AnyRecord, title: string) => ChartOutput | null> = {
  levels: levelsChart,
  rotation: rotationChart,
  spin: spinChart,
  boltzmannPlot: boltzmannChart,
  microstates: microstatesChart,
  sweep: sweepChartOf,
}

/** The chart for a calculation, or null for kinds whose result is a table only. Never throws. */
export function pdfChartForCalculation(calculation: Calculation, title: string): ChartOutput | null {
  const build = builders[calculation.kind]
  if (!build || calculation.result === null || typeof calculation.result !== 'object') return null
  try {
    return build(calculation.result as AnyRecord, title)
  }
  catch {
    return null
  }
}
