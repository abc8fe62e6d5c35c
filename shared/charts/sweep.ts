import { fittedHorizontalAxis, linearAxis, logAxis, mapper, rightOverflow, type ContinuousAxis } from './axes'
import {
  axisTitle, BOTTOM_MARGIN, bottomAxis, chartSize, EXPONENT_FONT, leftAxis, leftMargin, legend, noDataChart, svgDocument,
  TICK_FONT, titleBlock, Y_TITLE_SPACE, type LegendEntry,
} from './draw'
import { formatNumber } from './format'
import { seriesStyle, temperatureColor } from './palette'
import type { ChartOptions, ChartOutput } from './types'
import { element, pathData } from './xml'

export interface SweepSeries {
  name: string
  /** One value per x; null (or a non-finite number) leaves a gap in the line. */
  values: (number | null)[]
  unit?: string
  /**
   * Temperature this series was computed at. When every series has one, series are
   * coloured cool to warm by temperature (the one place the chart palette uses it).
   */
  temperature?: number
}

export interface SweepChartData {
  x: number[]
  xLabel: string
  xUnit: string
  series: SweepSeries[]
  yLabel: string
  logX?: boolean
  logY?: boolean
}

const DEFAULT_TITLE = 'Sweep'

/**
 * Lines of one or more series against a swept quantity (temperature, field, ...). Gaps for
 * missing values; each series has its own colour and dash pattern, named in a legend.
 */
export function sweepChart(data: SweepChartData, options: ChartOptions = {}): ChartOutput {
  const xs = data.x ?? []
  const series = data.series ?? []
  const units = [...new Set(series.map((entry) => (entry.unit ?? '').trim()))]
  const sharedUnit = units.length === 1 ? units[0]! : ''
  const seriesName = (entry: SweepSeries) =>
    !sharedUnit && (entry.unit ?? '').trim() ? `${entry.name} (${entry.unit!.trim()})` : String(entry.name ?? '')
  const xTitle = axisTitle(data.xLabel ?? '', data.xUnit)
  const yTitle = axisTitle(data.yLabel ?? '', sharedUnit)
  const table = {
    headers: [xTitle, ...series.map(seriesName)],
    rows: xs.map((x, index) => [
      formatNumber(x, 6),
      ...series.map((entry) => {
        const value = entry.values?.[index]
        return typeof value === 'number' && Number.isFinite(value) ? formatNumber(value, 6) : '—'
      }),
    ]),
  }

  // Plot units: log10 on log axes, so values <= 0 there become NaN and are skipped.
  const toPlotX = (value: number) => (data.logX ? (value > 0 ? Math.log10(value) : NaN) : value)
  const toPlotY = (value: number | null | undefined) =>
    typeof value !== 'number' ? NaN : data.logY ? (value > 0 ? Math.log10(value) : NaN) : value
  const plotX = xs.map((x) => (typeof x === 'number' ? toPlotX(x) : NaN))
  const plotted = series.map((entry) => xs.map((_, index) => {
    const x = plotX[index]!
    const y = toPlotY(entry.values?.[index])
    return Number.isFinite(x) && Number.isFinite(y) ? ([x, y] as [number, number]) : null
  }))
  const points = plotted.flat().filter((point): point is [number, number] => point !== null)
  const given = series.reduce((count, entry) => count + xs.filter((_, index) => entry.values?.[index] !== null && entry.values?.[index] !== undefined).length, 0)
  const skipped = given - points.length
  if (points.length === 0) {
    const reason = series.length === 0 || xs.length === 0
      ? 'no series or no x values were given.'
      : `none of the ${given} values can be plotted${data.logX || data.logY ? ' (a log axis needs positive numbers)' : ''}.`
    return noDataChart(options, DEFAULT_TITLE, reason, table)
  }

  const size = chartSize(options)
  const heading = titleBlock(size, options.title)
  const temperatures = series.map((entry) => entry.temperature)
  const byTemperature = series.length > 1 && temperatures.every((t) => typeof t === 'number' && Number.isFinite(t))
  // Kelvin spanning more than a factor of 5 are spread on a log scale, so 10 K, 50 K and
  // 300 K do not all come out the same blue next to 10 000 K.
  const logTemperature = byTemperature && (temperatures as number[]).every((t) => t > 0)
    && Math.max(...(temperatures as number[])) / Math.min(...(temperatures as number[])) > 5
  const position = (t: number) => (logTemperature ? Math.log10(t) : t)
  const coldest = byTemperature ? Math.min(...(temperatures as number[]).map(position)) : 0
  const hottest = byTemperature ? Math.max(...(temperatures as number[]).map(position)) : 0
  const entries: LegendEntry[] = series.map((entry, index) => {
    const style = seriesStyle(index)
    const color = byTemperature ? temperatureColor(hottest > coldest ? (position(entry.temperature!) - coldest) / (hottest - coldest) : 0.5) : style.color
    const isolatedOnly = plotted[index]!.every((point, i, all) => point === null || (!all[i - 1] && !all[i + 1]))
    return { name: seriesName(entry), color, dash: style.dash, marker: isolatedOnly }
  })
  const legendBlock = legend(entries, 4, heading.height, size.width - 8)
  const area = { left: 0, top: heading.height + legendBlock.height + Y_TITLE_SPACE, right: size.width - 20, bottom: size.height - BOTTOM_MARGIN }
  const yCount = Math.max(2, Math.round((area.bottom - area.top) / 40))
  const ys = points.map((point) => point[1])
  const xsPlotted = points.map((point) => point[0])
  const yAxis: ContinuousAxis = data.logY
    ? logAxis(Math.min(...ys), Math.max(...ys), yCount)
    : linearAxis(Math.min(...ys), Math.max(...ys), yCount)
  area.left = leftMargin(yAxis)
  const width = area.right - area.left
  const xAxis = fittedHorizontalAxis(
    (count) => (data.logX ? logAxis(Math.min(...xsPlotted), Math.max(...xsPlotted), count) : linearAxis(Math.min(...xsPlotted), Math.max(...xsPlotted), count)),
    Math.max(2, Math.round(width / 80)), width, TICK_FONT, EXPONENT_FONT)
  area.right -= rightOverflow(xAxis, size.width - area.right, TICK_FONT, EXPONENT_FONT)
  const toX = mapper(xAxis.domain, [area.left, area.right])
  const toY = mapper(yAxis.domain, [area.bottom, area.top])

  let body = heading.markup + legendBlock.markup
  body += leftAxis(yAxis, area, yTitle)
  body += bottomAxis(xAxis, area, xTitle)
  for (const [index, points] of plotted.entries()) {
    const { color, dash } = entries[index]!
    // One path per series; a gap (null, non-finite, off a log axis) starts a new piece.
    let d = ''
    let piece: Array<[number, number]> = []
    for (const point of [...points, null]) {
      const pixel = point && ([toX(point[0]), toY(point[1])] as [number, number])
      if (pixel && Number.isFinite(pixel[0]) && Number.isFinite(pixel[1])) {
        piece.push(pixel)
      } else {
        if (piece.length > 1) d += pathData(piece)
        piece = []
      }
    }
    if (d) body += element('path', { d, fill: 'none', stroke: color, 'stroke-width': 2, 'stroke-dasharray': dash || undefined, 'stroke-linejoin': 'round' })
    // A point with missing neighbours draws no line: mark it so it is not lost.
    for (const [i, point] of points.entries()) {
      if (point && !points[i - 1] && !points[i + 1]) body += element('circle', { cx: toX(point[0]), cy: toY(point[1]), r: 3, fill: color })
    }
  }

  // Alt text: what against what, the ranges, and the overall maximum.
  let best: { series: number; index: number; y: number } | undefined
  for (const [seriesIndex, entry] of series.entries()) {
    for (const [index, value] of (entry.values ?? []).entries()) {
      if (typeof value === 'number' && plotted[seriesIndex]![index] && (!best || value > best.y)) best = { series: seriesIndex, index, y: value }
    }
  }
  const xUnitText = (data.xUnit ?? '').trim() ? ` ${data.xUnit.trim()}` : ''
  const yUnitText = (unitOf: SweepSeries) => ((unitOf.unit ?? '').trim() ? ` ${unitOf.unit!.trim()}` : '')
  const xValues = points.map((point) => point[0])
  const fromX = data.logX ? 10 ** Math.min(...xValues) : Math.min(...xValues)
  const toXValue = data.logX ? 10 ** Math.max(...xValues) : Math.max(...xValues)
  const names = series.map((entry) => entry.name).join(', ')
  let alt = `${series.length === 1 ? 'Line' : `${series.length} lines`} of ${data.yLabel || 'value'} against ${data.xLabel || 'x'} from ${formatNumber(fromX, 4)} to ${formatNumber(toXValue, 4)}${xUnitText}${data.logX || data.logY ? ` (${[data.logX && 'log x', data.logY && 'log y'].filter(Boolean).join(', ')})` : ''}${series.length > 1 ? `: ${names}` : ''}.`
  if (best) {
    const entry = series[best.series]!
    alt += ` The highest value is ${formatNumber(best.y)}${yUnitText(entry)}${series.length > 1 ? ` (${entry.name})` : ''} at ${formatNumber(xs[best.index]!, 4)}${xUnitText}.`
  }
  if (skipped > 0) alt += ` ${skipped} value${skipped === 1 ? ' is' : 's are'} not plotted (not finite${data.logX || data.logY ? ', or not positive on a log axis' : ''}).`
  const title = options.title?.trim() || DEFAULT_TITLE
  return { svg: svgDocument(size, title, alt, body), alt, table }
}
