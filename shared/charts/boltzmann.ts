import { fittedHorizontalAxis, linearAxis, mapper, rightOverflow } from './axes'
import {
  axisTitle, BOTTOM_MARGIN, bottomAxis, chartSize, EXPONENT_FONT, leftAxis, leftMargin, line, noDataChart, svgDocument, text,
  TICK_FONT, titleBlock, Y_TITLE_SPACE,
} from './draw'
import { formatNumber } from './format'
import { DATA, INK_SOFT, SERIES_COLORS } from './palette'
import type { ChartOptions, ChartOutput } from './types'
import { element } from './xml'

export interface BoltzmannPoint {
  /** Upper-level energy of the line. */
  energy: number
  /** ln(I·λ/(g·A)) or similar: the ordinate of the Boltzmann plot. */
  y: number
  /** One standard uncertainty of y, drawn as an error bar. */
  uncertainty?: number
  label?: string
}

export interface BoltzmannPlotData {
  points: BoltzmannPoint[]
  /** The straight line y = slope·energy + intercept (slope = −1/kT in the energy unit). */
  fit: { slope: number; intercept: number }
  energyUnit: string
  /** Ordinate name, e.g. "ln(I/g)". */
  yLabel: string
  /** y − fit per point, in the same order as points. */
  residuals: number[]
}

const DEFAULT_TITLE = 'Boltzmann plot'
const FIT_COLOR = SERIES_COLORS[1]
const PANEL_GAP = 14

/**
 * A Boltzmann plot: the points with error bars and the fitted straight line, and beneath
 * it a residual panel on the same energy axis.
 */
export function boltzmannPlotChart(data: BoltzmannPlotData, options: ChartOptions = {}): ChartOutput {
  const energyUnit = (data.energyUnit ?? '').trim()
  const yLabel = data.yLabel ?? 'y'
  const points = data.points ?? []
  const slope = data.fit?.slope
  const intercept = data.fit?.intercept
  const fitUsable = Number.isFinite(slope) && Number.isFinite(intercept)
  const residualOf = (index: number) => {
    const given = data.residuals?.[index]
    if (typeof given === 'number' && Number.isFinite(given)) return given
    const point = points[index]!
    return fitUsable ? point.y - (slope! * point.energy + intercept!) : NaN
  }
  const table = {
    headers: ['Line', axisTitle('Energy', energyUnit), yLabel, 'Uncertainty', 'Fit', 'Residual'],
    rows: points.map((point, index) => [
      point.label ?? String(index + 1),
      formatNumber(point.energy, 6),
      formatNumber(point.y, 5),
      point.uncertainty === undefined ? '—' : formatNumber(point.uncertainty, 3),
      fitUsable ? formatNumber(slope! * point.energy + intercept!, 5) : '—',
      formatNumber(residualOf(index), 3),
    ]),
  }

  const usable = points
    .map((point, index) => ({ point, index, residual: residualOf(index) }))
    .filter(({ point }) => Number.isFinite(point.energy) && Number.isFinite(point.y))
  const skipped = points.length - usable.length
  if (usable.length === 0) {
    return noDataChart(options, DEFAULT_TITLE, points.length === 0 ? 'no lines were given.' : `none of the ${points.length} lines has a finite energy and ${yLabel}.`, table)
  }
  const errorOf = (point: BoltzmannPoint) =>
    typeof point.uncertainty === 'number' && Number.isFinite(point.uncertainty) && point.uncertainty > 0 ? point.uncertainty : 0

  const size = chartSize(options)
  const heading = titleBlock(size, options.title)
  const top = heading.height + Y_TITLE_SPACE
  const bottom = size.height - BOTTOM_MARGIN
  // Residual panel: a third of the height, with its own horizontal title above it.
  const residualHeight = Math.max(40, Math.round((bottom - top) * 0.28))
  const mainArea = { left: 0, top, right: size.width - 20, bottom: bottom - residualHeight - PANEL_GAP - Y_TITLE_SPACE + 10 }
  const residualArea = { left: 0, top: bottom - residualHeight, right: size.width - 20, bottom }

  const energies = usable.map(({ point }) => point.energy)
  const lows = usable.map(({ point }) => point.y - errorOf(point))
  const highs = usable.map(({ point }) => point.y + errorOf(point))
  const fitEnds = fitUsable ? [Math.min(...energies), Math.max(...energies)].map((e) => slope! * e + intercept!) : []
  const yAxis = linearAxis(Math.min(...lows, ...fitEnds.filter(Number.isFinite)), Math.max(...highs, ...fitEnds.filter(Number.isFinite)), Math.max(2, Math.round((mainArea.bottom - mainArea.top) / 40)))
  const residualPoints = usable.filter(({ residual }) => Number.isFinite(residual))
  const residualExtent = Math.max(0, ...residualPoints.map(({ point, residual }) => Math.abs(residual) + errorOf(point)))
  const residualAxis = linearAxis(-residualExtent, residualExtent, residualHeight < 80 ? 2 : 4, { includeZero: true })
  const left = Math.max(leftMargin(yAxis), leftMargin(residualAxis))
  mainArea.left = left
  residualArea.left = left
  const width = mainArea.right - left
  const xAxis = fittedHorizontalAxis((count) => linearAxis(Math.min(...energies), Math.max(...energies), count),
    Math.max(2, Math.round(width / 80)), width, TICK_FONT, EXPONENT_FONT)
  const overflow = rightOverflow(xAxis, size.width - mainArea.right, TICK_FONT, EXPONENT_FONT)
  mainArea.right -= overflow
  residualArea.right -= overflow
  const toX = mapper(xAxis.domain, [left, mainArea.right])
  const toY = mapper(yAxis.domain, [mainArea.bottom, mainArea.top])
  const toResidualY = mapper(residualAxis.domain, [residualArea.bottom, residualArea.top])

  let body = heading.markup
  body += leftAxis(yAxis, mainArea, yLabel, { titleWidth: mainArea.right - 170 })
  body += bottomAxis(xAxis, mainArea, '', { labels: false })
  body += leftAxis(residualAxis, residualArea, `Residual (${yLabel} − fit)`)
  body += bottomAxis(xAxis, residualArea, axisTitle('Energy', energyUnit))
  body += line(left, toResidualY(0), residualArea.right, toResidualY(0), INK_SOFT, 1, '4 3')

  if (fitUsable) {
    // Drawn over the measured energies only: the fit says nothing beyond them.
    const [x0, x1] = [Math.min(...energies), Math.max(...energies)]
    body += line(toX(x0), toY(slope! * x0 + intercept!), toX(x1), toY(slope! * x1 + intercept!), FIT_COLOR, 2, '8 4')
  }
  const errorBar = (x: number, yLow: number, yHigh: number) =>
    line(x, yLow, x, yHigh, DATA, 1.5) + line(x - 4, yLow, x + 4, yLow, DATA, 1.5) + line(x - 4, yHigh, x + 4, yHigh, DATA, 1.5)
  for (const { point, residual } of usable) {
    const x = toX(point.energy)
    const error = errorOf(point)
    if (error > 0) body += errorBar(x, toY(point.y - error), toY(point.y + error))
    body += element('circle', { cx: x, cy: toY(point.y), r: 3.5, fill: DATA })
    if (Number.isFinite(residual)) {
      if (error > 0) body += errorBar(x, toResidualY(residual - error), toResidualY(residual + error))
      body += element('circle', { cx: x, cy: toResidualY(residual), r: 3, fill: DATA })
    }
  }
  // Key: which mark is data and which is the fit (by shape and dash, not colour alone).
  const keyY = mainArea.top - 17 - 13 * 0.35
  const keyRight = mainArea.right
  body += line(keyRight - 110, keyY, keyRight - 80, keyY, FIT_COLOR, 2, '8 4')
  body += text(keyRight - 74, keyY + 4, 'fitted line')
  body += element('circle', { cx: keyRight - 150, cy: keyY, r: 3.5, fill: DATA })
  body += text(keyRight - 142, keyY + 4, 'lines')

  const unitText = energyUnit ? ` ${energyUnit}` : ''
  let alt = `Boltzmann plot of ${yLabel} against energy for ${usable.length} line${usable.length === 1 ? '' : 's'}, energies ${usable.length === 1 ? formatNumber(energies[0]!, 4) : `${formatNumber(Math.min(...energies), 4)} to ${formatNumber(Math.max(...energies), 4)}`}${unitText}, with a residual panel beneath.`
  alt += fitUsable
    ? ` Fitted line: slope ${formatNumber(slope!, 4)} per${unitText || ' energy unit'}, intercept ${formatNumber(intercept!, 4)}`
    : ' No fitted line is drawn because the fit is not a finite number'
  const largest = residualPoints.reduce<typeof residualPoints[number] | undefined>((most, entry) => (!most || Math.abs(entry.residual) > Math.abs(most.residual) ? entry : most), undefined)
  alt += largest ? `; the largest residual is ${formatNumber(largest.residual)} at ${formatNumber(largest.point.energy, 4)}${unitText}${largest.point.label ? ` (${largest.point.label})` : ''}.` : '.'
  if (skipped > 0) alt += ` ${skipped} line${skipped === 1 ? ' is' : 's are'} not plotted because the energy or ${yLabel} is not finite.`
  const title = options.title?.trim() || DEFAULT_TITLE
  return { svg: svgDocument(size, title, alt, body), alt, table }
}
