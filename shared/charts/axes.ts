// Tick models for the three kinds of axis the charts use. Values are in "plot units":
// the quantity itself on a linear axis, its base-10 logarithm on a log axis (so a
// population of 10⁻⁴⁰⁰, known only by its log10, still has a place on the axis).

import { scaleLinear } from 'd3-scale'
import { numberParts, tickParts, type NumberParts } from './format'
import { textWidth, truncateText } from './measure'

export interface Tick {
  /** Position in plot units. */
  value: number
  label: NumberParts
}

export interface ContinuousAxis {
  kind: 'linear' | 'log'
  /** Domain in plot units, low to high, never empty. */
  domain: [number, number]
  ticks: Tick[]
  /** Unlabelled small ticks (log axes: 2…9 within each decade). */
  minorTicks: number[]
}

/** Widens a degenerate or missing extent so that a scale can be built from it. */
export function usableExtent(low: number, high: number, options: { includeZero?: boolean } = {}): [number, number] {
  let [a, b] = Number.isFinite(low) && Number.isFinite(high) ? [Math.min(low, high), Math.max(low, high)] : [0, 1]
  if (options.includeZero) {
    a = Math.min(a, 0)
    b = Math.max(b, 0)
  }
  // Spans near the subnormal range break tick arithmetic: treat them as one value.
  if (b - a < 1e-290) {
    b = a
  }
  if (a === b) {
    // A single value or all-equal values: centre it in a band a tenth of its size.
    const half = Math.abs(a) < 1e-280 ? 1 : Math.abs(a) * 0.1
    if (Math.abs(a) < 1e-280) return options.includeZero ? [0, 1] : [a - half, a + half]
    if (options.includeZero) return a > 0 ? [0, a * 1.1] : [a * 1.1, 0]
    return [a - half, b + half]
  }
  // Beyond ±1e307 the span overflows; pull the ends in so arithmetic stays finite.
  const limit = 8e307
  return [Math.max(a, -limit), Math.min(b, limit)]
}

/** Linear axis with d3's nice ticks (1, 2, 5 × 10ⁿ steps) and a domain extended to them. */
export function linearAxis(low: number, high: number, count: number, options: { includeZero?: boolean } = {}): ContinuousAxis {
  const extent = usableExtent(low, high, options)
  let domain = scaleLinear().domain(extent).nice(count).domain() as [number, number]
  if (!domain.every(Number.isFinite) || domain[0] === domain[1]) domain = extent
  let values: number[]
  try {
    values = scaleLinear().domain(domain).ticks(count).filter(Number.isFinite)
  } catch {
    values = [] // d3 cannot step through some extreme domains; fall back to the ends
  }
  if (values.length === 0) values = [domain[0], domain[1]]
  const labels = tickParts(values)
  return {
    kind: 'linear',
    domain,
    ticks: values.map((value, index) => ({ value, label: labels[index]! })),
    minorTicks: [],
  }
}

const decadeSteps = [1, 2, 3, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000, 2000, 5000, 10000]

/**
 * Log axis from log10 extents. Labels are powers of ten (10⁻⁵); over one or two decades the
 * 2 and 5 (or all 1…9) multiples are labelled too so the axis still has several ticks.
 */
export function logAxis(lowLog10: number, highLog10: number, count: number): ContinuousAxis {
  const [a, b] = usableExtent(lowLog10, highLog10)
  const low = a === b ? a - 0.5 : a
  const high = a === b ? b + 0.5 : b
  // `|| 0` turns -0 into 0.
  let first = Math.floor(low + 1e-9) || 0
  let last = Math.ceil(high - 1e-9) || 0
  if (first === last) last = first + 1
  const decades = last - first
  const ticks: Tick[] = []
  const minorTicks: number[] = []
  const wanted = Math.max(2, count)
  const labelled = (exponent: number, multiples: number[]) => {
    for (const multiple of multiples) {
      const value = exponent + Math.log10(multiple)
      if (value > last + 1e-9) break
      if (multiple === 1) ticks.push({ value, label: { base: '10', exponent: String(exponent).replace('-', '\u2212') } })
      else if (exponent > -300 && exponent < 300) ticks.push({ value, label: numberParts(multiple * 10 ** exponent, 1) })
    }
  }
  if (decades * 9 <= wanted + 1) {
    for (let exponent = first; exponent <= last; exponent++) labelled(exponent, [1, 2, 3, 4, 5, 6, 7, 8, 9])
  } else if (decades * 3 <= wanted + 1) {
    for (let exponent = first; exponent <= last; exponent++) {
      labelled(exponent, [1, 2, 5])
      if (exponent < last) for (const multiple of [3, 4, 6, 7, 8, 9]) minorTicks.push(exponent + Math.log10(multiple))
    }
  } else {
    const step = decadeSteps.find((candidate) => decades / candidate <= wanted) ?? Math.ceil(decades / wanted)
    first = Math.floor(first / step) * step || 0
    last = Math.ceil(last / step) * step || 0
    // The count guard stops a loop whose step is lost in rounding (|exponent| near 1e308).
    for (let exponent = first, guard = 0; exponent <= last && guard < 64; exponent += step, guard++) labelled(exponent, [1])
    if (step === 1 && decades <= 12) {
      for (let exponent = first; exponent < last; exponent++) {
        for (let multiple = 2; multiple <= 9; multiple++) minorTicks.push(exponent + Math.log10(multiple))
      }
    }
  }
  return { kind: 'log', domain: [first, last], ticks, minorTicks }
}

/** Maps plot units to pixels; `range` may run high to low (y axes). */
export function mapper(domain: [number, number], range: [number, number]): (value: number) => number {
  const [d0, d1] = domain
  const [r0, r1] = range
  const span = d1 - d0
  return (value) => r0 + ((value - d0) / span) * (r1 - r0)
}

/** Widest tick label in pixels at `fontSize` (exponents drawn smaller). */
export function widestTickLabel(axis: ContinuousAxis, fontSize: number, exponentSize: number): number {
  return Math.max(0, ...axis.ticks.map((tick) => tickLabelWidth(tick.label, fontSize, exponentSize)))
}

export function tickLabelWidth(label: NumberParts, fontSize: number, exponentSize: number): number {
  return textWidth(label.base, fontSize) + (label.exponent === undefined ? 0 : textWidth(label.exponent, exponentSize) + 1)
}

/**
 * Builds a horizontal continuous axis with as many ticks as fit without labels touching,
 * starting from `preferredCount` and asking for fewer until they fit.
 */
export function fittedHorizontalAxis(
  build: (count: number) => ContinuousAxis,
  preferredCount: number,
  pixelWidth: number,
  fontSize: number,
  exponentSize: number,
): ContinuousAxis {
  let axis = build(preferredCount)
  for (let count = preferredCount; count >= 2; count--) {
    axis = build(count)
    const toPixel = mapper(axis.domain, [0, pixelWidth])
    let previousRight = -Infinity
    let fits = true
    for (const tick of axis.ticks) {
      const width = tickLabelWidth(tick.label, fontSize, exponentSize)
      const centre = toPixel(tick.value)
      if (centre - width / 2 < previousRight + 8) {
        fits = false
        break
      }
      previousRight = centre + width / 2
    }
    if (fits) return axis
  }
  return axis
}

/**
 * How far the last tick label would stick out past the drawing's right edge, given
 * `rightRoom` pixels between the axis end and that edge; 0 when it fits.
 */
export function rightOverflow(axis: ContinuousAxis, rightRoom: number, fontSize: number, exponentSize: number): number {
  const last = axis.ticks.reduce<Tick | undefined>((found, tick) => (!found || tick.value > found.value ? tick : found), undefined)
  if (!last || Math.abs(last.value - axis.domain[1]) > 1e-9 * Math.max(1, Math.abs(axis.domain[1]))) return 0
  return Math.max(0, Math.ceil(tickLabelWidth(last.label, fontSize, exponentSize) / 2 + 2 - rightRoom))
}

export interface BandLabel {
  index: number
  text: string
}

/**
 * Category labels under bands of width `band`: every k-th label is shown, the smallest k
 * that keeps them apart, and labels longer than the room they get are shortened with "…".
 */
export function bandLabels(labels: string[], band: number, fontSize: number): BandLabel[] {
  if (labels.length === 0) return []
  const gap = 6
  let every = 1
  const widest = Math.max(...labels.map((label) => textWidth(label, fontSize)))
  while (every < labels.length && widest + gap > band * every && every < 64) every++
  // Thin rather than shorten, but keep at least four labels; past that, shorten with "…".
  every = Math.min(every, Math.max(1, Math.ceil(labels.length / 4)))
  const room = Math.max(band * every - gap, fontSize * 1.5)
  const shown: BandLabel[] = []
  for (let index = 0; index < labels.length; index += every) {
    shown.push({ index, text: truncateText(labels[index]!, fontSize, room) })
  }
  return shown
}
