import { bandLabels, linearAxis, mapper } from './axes'
import {
  BOTTOM_MARGIN, chartSize, leftAxis, leftMargin, line, noDataChart, svgDocument, text, TICK_FONT, titleBlock, xAxisTitle,
  Y_TITLE_SPACE,
} from './draw'
import { formatNumber, numberParts } from './format'
import { textWidth } from './measure'
import { DATA, INK, INK_SOFT } from './palette'
import type { ChartOptions, ChartOutput } from './types'
import { element } from './xml'

export interface DistributionChartData {
  bars: { label: string; value: number }[]
  /** What the bars are, e.g. "Distribution (n₀, n₁, n₂)". */
  xLabel: string
  /** Quantity and unit of the bar height, e.g. "Microstates W" or "Probability". */
  yLabel: string
}

const DEFAULT_TITLE = 'Distribution'

/** Bars in the given order, e.g. microstate counts or probabilities per distribution. */
export function distributionChart(data: DistributionChartData, options: ChartOptions = {}): ChartOutput {
  const bars = data.bars ?? []
  const xLabel = data.xLabel ?? ''
  const yLabel = data.yLabel ?? ''
  const table = {
    headers: [xLabel || 'Label', yLabel || 'Value'],
    rows: bars.map((bar) => [String(bar.label ?? ''), formatNumber(bar.value, 6)]),
  }
  const plotted = bars.filter((bar) => typeof bar.value === 'number' && Number.isFinite(bar.value))
  const skipped = bars.length - plotted.length
  if (plotted.length === 0) {
    return noDataChart(options, DEFAULT_TITLE, bars.length === 0 ? 'no bars were given.' : `none of the ${bars.length} values is a finite number.`, table)
  }

  const size = chartSize(options)
  const heading = titleBlock(size, options.title)
  const area = { left: 0, top: heading.height + Y_TITLE_SPACE, right: size.width - 16, bottom: size.height - BOTTOM_MARGIN }
  const values = plotted.map((bar) => bar.value)
  const yAxis = linearAxis(Math.min(0, ...values), Math.max(0, ...values), Math.max(2, Math.round((area.bottom - area.top) / 40)), { includeZero: true })
  area.left = leftMargin(yAxis)
  const toY = mapper(yAxis.domain, [area.bottom, area.top])
  const band = (area.right - area.left) / plotted.length
  const barWidth = Math.max(1, band * (plotted.length === 1 ? 0.4 : 0.72))

  let body = heading.markup + leftAxis(yAxis, area, yLabel)
  const zero = toY(0)
  // Values printed on the bars when every one fits over its bar.
  const valueLabels = plotted.map((bar) => numberParts(bar.value, 3))
  const showValues = plotted.length <= 16 && valueLabels.every((parts) =>
    textWidth(parts.base, TICK_FONT) + (parts.exponent ? textWidth(parts.exponent, 11) : 0) <= band - 4)
  for (const [index, bar] of plotted.entries()) {
    const centre = area.left + band * (index + 0.5)
    const top = toY(bar.value)
    body += element('rect', {
      x: centre - barWidth / 2, y: Math.min(top, zero), width: barWidth, height: Math.max(0.5, Math.abs(zero - top)), fill: DATA,
    })
    if (showValues) {
      const y = bar.value >= 0 ? top - 5 : top + TICK_FONT + 3
      body += text(centre, y, valueLabels[index]!, { anchor: 'middle', fill: INK_SOFT })
    }
  }
  body += line(area.left, zero, area.right, zero, INK, 1)
  if (zero !== area.bottom) body += line(area.left, area.bottom, area.right, area.bottom, INK_SOFT, 1)
  for (const shown of bandLabels(plotted.map((bar) => String(bar.label ?? '')), band, TICK_FONT)) {
    const centre = area.left + band * (shown.index + 0.5)
    body += line(centre, area.bottom, centre, area.bottom + 5, INK, 1)
    body += text(centre, area.bottom + 5 + TICK_FONT + 3, shown.text, { anchor: 'middle' })
  }
  body += xAxisTitle(area, xLabel)

  const largest = plotted.reduce((best, bar) => (bar.value > best.value ? bar : best))
  const ties = plotted.filter((bar) => bar.value === largest.value).length
  let alt = `Bar chart of ${yLabel || 'value'} for ${plotted.length} ${xLabel ? `bars (${xLabel})` : 'bars'}, values ${plotted.length === 1 ? formatNumber(values[0]!) : `from ${formatNumber(Math.min(...values))} to ${formatNumber(Math.max(...values))}`}.`
  alt += ` The largest is ${largest.label} with ${formatNumber(largest.value)}${ties > 1 ? `, tied with ${ties - 1} other${ties === 2 ? '' : 's'}` : ''}.`
  if (skipped > 0) alt += ` ${skipped} bar${skipped === 1 ? ' is' : 's are'} not drawn because the value is not a finite number.`
  const title = options.title?.trim() || DEFAULT_TITLE
  return { svg: svgDocument(size, title, alt, body), alt, table }
}
