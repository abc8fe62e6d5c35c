// Drawing pieces shared by the charts: the SVG document, text with raised exponents, axes,
// legend and the "no data" chart. Only basic elements and inline presentation attributes,
// so pdfmake's SVG support draws the same thing as the browser.

import type { ContinuousAxis } from './axes'
import { mapper } from './axes'
import type { NumberParts } from './format'
import { textWidth, truncateText } from './measure'
import { FONT_FAMILY, GRID, INK, INK_FAINT, INK_SOFT } from './palette'
import type { ChartOptions, ChartOutput, ChartTable } from './types'
import { element, escapeXml } from './xml'

export const TICK_FONT = 12
export const EXPONENT_FONT = 11
export const LABEL_FONT = 13
export const TITLE_FONT = 15
export const MESSAGE_FONT = 14
const TICK_LENGTH = 5

export interface Size {
  width: number
  height: number
}

/** Width and height from options, with defaults and a floor that still fits axes. */
export function chartSize(options: ChartOptions): Size {
  const pick = (value: number | undefined, fallback: number, minimum: number) =>
    typeof value === 'number' && Number.isFinite(value) && value > 0 ? Math.max(minimum, Math.min(value, 10000)) : fallback
  return { width: pick(options.width, 640, 200), height: pick(options.height, 320, 160) }
}

/** The standalone SVG document: namespace, viewBox, role, <title> and <desc> first. */
export function svgDocument(size: Size, title: string, description: string, body: string): string {
  const open = element('svg', {
    xmlns: 'http://www.w3.org/2000/svg',
    width: size.width,
    height: size.height,
    viewBox: `0 0 ${size.width} ${size.height}`,
    role: 'img',
    'font-family': FONT_FAMILY,
    'font-variant': 'tabular-nums',
    fill: 'none',
  }, '')
  return `${open.slice(0, -'</svg>'.length)}<title>${escapeXml(title)}</title><desc>${escapeXml(description)}</desc>${body}</svg>`
}

export interface TextOptions {
  size?: number
  anchor?: 'start' | 'middle' | 'end'
  fill?: string
  weight?: 'bold'
}

/** A text element; `content` is plain text (escaped here) or number parts with an exponent. */
export function text(x: number, y: number, content: string | NumberParts, options: TextOptions = {}): string {
  const size = options.size ?? TICK_FONT
  const parts: NumberParts = typeof content === 'string' ? { base: content } : content
  let inner = escapeXml(parts.base)
  if (parts.exponent !== undefined) {
    const exponentSize = Math.max(EXPONENT_FONT, Math.round(size * 0.8))
    inner += element('tspan', { dy: -Math.round(size * 0.4), 'font-size': exponentSize }, escapeXml(parts.exponent))
  }
  return element(
    'text',
    {
      x,
      y,
      'font-size': size,
      'text-anchor': options.anchor === 'start' ? undefined : options.anchor,
      'font-weight': options.weight,
      fill: options.fill ?? INK,
    },
    inner,
  )
}

export function line(x1: number, y1: number, x2: number, y2: number, stroke = INK, width = 1, dash?: string): string {
  return element('line', { x1, y1, x2, y2, stroke, 'stroke-width': width, 'stroke-dasharray': dash || undefined })
}

/** Axis title: "quantity (unit)", or just the quantity when there is no unit. */
export function axisTitle(quantity: string, unit?: string): string {
  const trimmedUnit = (unit ?? '').trim()
  const trimmedQuantity = quantity.trim()
  if (!trimmedUnit) return trimmedQuantity
  return trimmedQuantity ? `${trimmedQuantity} (${trimmedUnit})` : trimmedUnit
}

export interface PlotArea {
  left: number
  top: number
  right: number
  bottom: number
}

/**
 * Left axis: gridlines across the plot, tick marks and labels. The axis title is written
 * horizontally above the axis (no rotated text: easier to read and to print).
 */
export function leftAxis(axis: ContinuousAxis, area: PlotArea, title: string, options: { grid?: boolean; titleWidth?: number } = {}): string {
  const toY = mapper(axis.domain, [area.bottom, area.top])
  let out = ''
  if (options.grid !== false) {
    for (const tick of axis.ticks) out += line(area.left, toY(tick.value), area.right, toY(tick.value), GRID, 1)
  }
  for (const value of axis.minorTicks) out += line(area.left - 3, toY(value), area.left, toY(value), INK_SOFT, 1)
  for (const tick of axis.ticks) {
    const y = toY(tick.value)
    out += line(area.left - TICK_LENGTH, y, area.left, y, INK, 1)
    out += text(area.left - TICK_LENGTH - 3, y + TICK_FONT * 0.35, tick.label, { anchor: 'end' })
  }
  out += line(area.left, area.top, area.left, area.bottom, INK, 1)
  if (title) {
    const room = options.titleWidth ?? area.right - 4
    out += text(4, area.top - 17, truncateText(title, LABEL_FONT, room), { size: LABEL_FONT, fill: INK })
  }
  return out
}

/** Bottom axis for continuous values; `labels: false` draws tick marks only (upper panels). */
export function bottomAxis(
  axis: ContinuousAxis,
  area: PlotArea,
  title: string,
  options: { labels?: boolean; grid?: boolean } = {},
): string {
  const toX = mapper(axis.domain, [area.left, area.right])
  let out = ''
  if (options.grid) {
    for (const tick of axis.ticks) out += line(toX(tick.value), area.top, toX(tick.value), area.bottom, GRID, 1)
  }
  for (const value of axis.minorTicks) out += line(toX(value), area.bottom, toX(value), area.bottom + 3, INK_SOFT, 1)
  for (const tick of axis.ticks) {
    const x = toX(tick.value)
    out += line(x, area.bottom, x, area.bottom + TICK_LENGTH, INK, 1)
    if (options.labels !== false) out += text(x, area.bottom + TICK_LENGTH + TICK_FONT + 3, tick.label, { anchor: 'middle' })
  }
  out += line(area.left, area.bottom, area.right, area.bottom, INK, 1)
  if (title && options.labels !== false) out += xAxisTitle(area, title)
  return out
}

/** The x-axis title, centred under the plot. */
export function xAxisTitle(area: PlotArea, title: string): string {
  const y = area.bottom + TICK_LENGTH + TICK_FONT + 3 + LABEL_FONT + 9
  const room = area.right - area.left + 40
  return text((area.left + area.right) / 2, y, truncateText(title, LABEL_FONT, room), { size: LABEL_FONT, anchor: 'middle' })
}

/** Space above the plot for the horizontal y-axis title (clear of a raised exponent). */
export const Y_TITLE_SPACE = LABEL_FONT + 26

/** Space under the plot for tick labels and the x-axis title. */
export const BOTTOM_MARGIN = TICK_LENGTH + TICK_FONT + 3 + LABEL_FONT + 9 + 8

/** Space needed left of the plot for y tick labels. */
export function leftMargin(axis: ContinuousAxis): number {
  const widest = Math.max(...axis.ticks.map((tick) =>
    textWidth(tick.label.base, TICK_FONT) + (tick.label.exponent === undefined ? 0 : textWidth(tick.label.exponent, EXPONENT_FONT) + 1)))
  return Math.ceil(Math.max(28, widest + TICK_LENGTH + 3 + 8))
}

/** Title line at the top when a title is given; returns the markup and the height used. */
export function titleBlock(size: Size, title: string | undefined): { markup: string; height: number } {
  if (!title || !title.trim()) return { markup: '', height: 0 }
  const shown = truncateText(title.trim(), TITLE_FONT, size.width - 8)
  return { markup: text(4, TITLE_FONT + 4, shown, { size: TITLE_FONT, weight: 'bold' }), height: TITLE_FONT + 12 }
}

export interface LegendEntry {
  name: string
  color: string
  dash: string
  /** A marker drawn on the swatch too (for series that are mostly single points). */
  marker?: boolean
}

const SWATCH = 30
const LEGEND_ROW = 18

/** Legend laid out in rows from the left; returns markup and the height used. */
export function legend(entries: LegendEntry[], x: number, y: number, maxWidth: number): { markup: string; height: number } {
  if (entries.length === 0) return { markup: '', height: 0 }
  let out = ''
  let cursor = x
  let row = 0
  const fontSize = TICK_FONT
  for (const entry of entries) {
    const name = truncateText(entry.name, fontSize, Math.max(60, maxWidth - SWATCH - 8))
    const width = SWATCH + 6 + textWidth(name, fontSize) + 18
    if (cursor > x && cursor + width - 18 > x + maxWidth) {
      row++
      cursor = x
    }
    const middle = y + row * LEGEND_ROW + LEGEND_ROW / 2
    out += line(cursor, middle, cursor + SWATCH, middle, entry.color, 2, entry.dash)
    if (entry.marker) out += element('circle', { cx: cursor + SWATCH / 2, cy: middle, r: 3, fill: entry.color })
    out += text(cursor + SWATCH + 6, middle + fontSize * 0.35, name, { size: fontSize })
    cursor += width
  }
  return { markup: out, height: (row + 1) * LEGEND_ROW + 4 }
}

/** The chart drawn when there is nothing to plot: a frame and a sentence saying why. */
export function noDataChart(options: ChartOptions, defaultTitle: string, reason: string, table: ChartTable): ChartOutput {
  const size = chartSize(options)
  const title = options.title?.trim() || defaultTitle
  const heading = titleBlock(size, options.title)
  const top = heading.height + 8
  let body = heading.markup
  body += element('rect', {
    x: 4.5, y: top + 0.5, width: size.width - 9, height: size.height - top - 5,
    fill: 'none', stroke: INK_FAINT, 'stroke-width': 1, 'stroke-dasharray': '4 4',
  })
  const middle = top + (size.height - top) / 2
  body += text(size.width / 2, middle, 'No data to plot', { size: MESSAGE_FONT, anchor: 'middle', weight: 'bold' })
  body += text(size.width / 2, middle + MESSAGE_FONT + 8, truncateText(reason, TICK_FONT, size.width - 24), { anchor: 'middle', fill: INK_SOFT })
  const alt = `No data to plot: ${reason}`
  return { svg: svgDocument(size, title, alt, body), alt, table }
}
