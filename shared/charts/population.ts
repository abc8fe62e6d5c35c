import { bandLabels, fittedHorizontalAxis, linearAxis, logAxis, mapper, rightOverflow, type ContinuousAxis } from './axes'
import {
  axisTitle, BOTTOM_MARGIN, bottomAxis, chartSize, EXPONENT_FONT, leftAxis, leftMargin, line, noDataChart,
  svgDocument, text, TICK_FONT, titleBlock, xAxisTitle, Y_TITLE_SPACE,
} from './draw'
import { formatFromLog10, formatNumber } from './format'
import { DATA, INK, INK_SOFT } from './palette'
import type { ChartOptions, ChartOutput } from './types'
import { element } from './xml'

export interface PopulationLevel {
  label: string
  energy: number
  fraction: number
  /** log10 of the fraction; finite even when the fraction underflows to 0. */
  log10Fraction: number
}

export interface PopulationChartData {
  levels: PopulationLevel[]
  /** Unit of the level energies, shown on the axis and in the table (e.g. "cm⁻¹"). */
  energyUnit: string
  scale: 'linear' | 'log'
  /**
   * What the x axis shows: level labels as bars in energy order, or energy itself with a
   * stem per level. Default: labels for up to 24 levels, energy beyond.
   */
  xAxis?: 'label' | 'energy'
}

const DEFAULT_TITLE = 'Population over levels'

/** Log10 of a level's fraction: the reported log10 if finite, otherwise from the fraction. */
function levelLog10(level: PopulationLevel): number {
  if (Number.isFinite(level.log10Fraction)) return level.log10Fraction
  return Number.isFinite(level.fraction) && level.fraction > 0 ? Math.log10(level.fraction) : NaN
}

/**
 * Population fractions per level, ordered by energy: bars over level labels (or stems at
 * each level's energy). On the log scale the bar heights come from `log10Fraction`, so
 * populations below the smallest double still plot.
 */
export function populationChart(data: PopulationChartData, options: ChartOptions = {}): ChartOutput {
  const energyUnit = data.energyUnit ?? ''
  const logScale = data.scale === 'log'
  const levels = [...(data.levels ?? [])].sort((a, b) => (a.energy ?? 0) - (b.energy ?? 0))
  const table = {
    headers: ['Level', axisTitle('Energy', energyUnit), 'Fraction', 'log10 fraction'],
    rows: levels.map((level) => [
      String(level.label ?? ''),
      formatNumber(level.energy, 6),
      level.fraction === 0 && Number.isFinite(level.log10Fraction) ? formatFromLog10(level.log10Fraction, 4) : formatNumber(level.fraction, 4),
      Number.isFinite(levelLog10(level)) ? formatNumber(levelLog10(level), 5) : '—',
    ]),
  }

  const plotted = levels.filter((level) =>
    Number.isFinite(level.energy) && (logScale ? Number.isFinite(levelLog10(level)) : Number.isFinite(level.fraction)))
  const skipped = levels.length - plotted.length
  const skippedNote = skipped > 0
    ? ` ${skipped} level${skipped === 1 ? ' is' : 's are'} not plotted because ${logScale ? 'the energy or population is missing, zero or not finite' : 'the energy or fraction is not a finite number'}.`
    : ''
  if (plotted.length === 0) {
    return noDataChart(options, DEFAULT_TITLE, levels.length === 0 ? 'no levels were given.' : `none of the ${levels.length} levels has a finite energy and population.`, table)
  }

  const size = chartSize(options)
  const heading = titleBlock(size, options.title)
  const useEnergyAxis = data.xAxis === 'energy' || (data.xAxis !== 'label' && plotted.length > 24)
  // Label mode writes each level's energy under its label: one more line of ticks.
  const energyRow = useEnergyAxis ? 0 : TICK_FONT + 4
  const area = { left: 0, top: heading.height + Y_TITLE_SPACE, right: size.width - 16, bottom: size.height - BOTTOM_MARGIN - energyRow }
  const yCount = Math.max(2, Math.round((area.bottom - area.top) / 40))
  const values = plotted.map((level) => (logScale ? levelLog10(level) : level.fraction))
  const yAxis: ContinuousAxis = logScale
    // The floor sits a little below the least populated level so its bar stays visible.
    ? logAxis(Math.min(...values) - 0.05 * Math.max(1, Math.max(...values) - Math.min(...values)), Math.max(...values), yCount)
    : linearAxis(Math.min(0, ...values), Math.max(...values), yCount, { includeZero: true })
  area.left = leftMargin(yAxis)
  const toY = mapper(yAxis.domain, [area.bottom, area.top])
  // Bars start at the axis floor: zero on a linear scale, the lowest decade on a log scale.
  const baseline = logScale ? yAxis.domain[0] : Math.max(yAxis.domain[0], Math.min(0, yAxis.domain[1]))
  const yTitle = logScale ? 'Population fraction (log scale)' : 'Population fraction'

  let body = heading.markup
  let xDescription: string
  if (useEnergyAxis) {
    const energies = plotted.map((level) => level.energy)
    const width = area.right - area.left
    const xAxis = fittedHorizontalAxis(
      (count) => linearAxis(Math.min(...energies), Math.max(...energies), count),
      Math.max(2, Math.round(width / 80)), width, TICK_FONT, EXPONENT_FONT)
    area.right -= rightOverflow(xAxis, size.width - area.right, TICK_FONT, EXPONENT_FONT)
    const toX = mapper(xAxis.domain, [area.left, area.right])
    body += leftAxis(yAxis, area, yTitle)
    body += bottomAxis(xAxis, area, axisTitle('Level energy', energyUnit))
    const stemWidth = Math.min(3, Math.max(1.5, (width / plotted.length) * 0.3))
    for (const level of plotted) {
      const x = toX(level.energy)
      const y = toY(logScale ? levelLog10(level) : level.fraction)
      body += line(x, toY(baseline), x, y, DATA, stemWidth)
      body += element('circle', { cx: x, cy: y, r: Math.max(2, stemWidth * 0.6 + 1), fill: DATA })
    }
    xDescription = 'energy'
  } else {
    const band = (area.right - area.left) / plotted.length
    const barWidth = Math.max(1, band * (plotted.length === 1 ? 0.4 : 0.7))
    body += leftAxis(yAxis, area, yTitle)
    for (const [index, level] of plotted.entries()) {
      const centre = area.left + band * (index + 0.5)
      const top = toY(logScale ? levelLog10(level) : level.fraction)
      const bottom = toY(baseline)
      body += element('rect', {
        x: centre - barWidth / 2, y: Math.min(top, bottom), width: barWidth, height: Math.max(0.5, Math.abs(bottom - top)), fill: DATA,
      })
    }
    body += line(area.left, area.bottom, area.right, area.bottom, INK, 1)
    const energyLabels = plotted.map((level) => formatNumber(level.energy, 4))
    const shownLabels = bandLabels(plotted.map((level) => String(level.label ?? '')), band, TICK_FONT)
    const shownEnergies = bandLabels(energyLabels, band, TICK_FONT)
    const every = Math.max(shownLabels[1]?.index ?? 1, shownEnergies[1]?.index ?? 1)
    for (let index = 0; index < plotted.length; index += every) {
      const centre = area.left + band * (index + 0.5)
      const label = shownLabels.find((shown) => shown.index === index)?.text
        ?? bandLabels([String(plotted[index]!.label ?? '')], band * every, TICK_FONT)[0]!.text
      body += line(centre, area.bottom, centre, area.bottom + 5, INK, 1)
      body += text(centre, area.bottom + 5 + TICK_FONT + 3, label, { anchor: 'middle' })
      body += text(centre, area.bottom + 5 + 2 * TICK_FONT + 7, energyLabels[index]!, { anchor: 'middle', fill: INK_SOFT })
    }
    body += xAxisTitle({ ...area, bottom: area.bottom + energyRow }, axisTitle('Level and its energy', energyUnit))
    xDescription = 'level'
  }

  // The most and least populated levels, compared by log10 so underflowed levels count.
  const byPopulation = plotted
    .map((level) => ({ level, log10: levelLog10(level) }))
    .filter((entry) => Number.isFinite(entry.log10))
  const most = byPopulation.reduce<typeof byPopulation[number] | undefined>((best, entry) => (!best || entry.log10 > best.log10 ? entry : best), undefined)
  const least = byPopulation.reduce<typeof byPopulation[number] | undefined>((worst, entry) => (!worst || entry.log10 < worst.log10 ? entry : worst), undefined)
  const energyText = (value: number) => `${formatNumber(value, 4)}${energyUnit.trim() ? ` ${energyUnit.trim()}` : ''}`
  const first = plotted[0]!.energy
  const last = plotted[plotted.length - 1]!.energy
  let alt = `Population fractions of ${plotted.length} level${plotted.length === 1 ? '' : 's'} by ${xDescription}, ${logScale ? 'log' : 'linear'} scale, energies ${plotted.length === 1 ? energyText(first) : `from ${energyText(first)} to ${energyText(last)}`}.`
  if (most) {
    alt += ` The most populated level is ${most.level.label} at ${energyText(most.level.energy)} with fraction ${formatFromLog10(most.log10)}`
    alt += least && least !== most && least.log10 < most.log10 ? `; the least is ${least.level.label} with ${formatFromLog10(least.log10)}.` : '.'
  } else if (!logScale) {
    alt += ' No level has a positive population.'
  }
  alt += skippedNote
  const title = options.title?.trim() || DEFAULT_TITLE
  return { svg: svgDocument(size, title, alt, body), alt, table }
}
