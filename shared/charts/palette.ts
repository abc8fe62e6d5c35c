// Thermotome's chart palette: ink on paper, data in blue-slate, a few calm accents.
// State colours (amber, deep green, brick red) are left out on purpose: on our pages they
// mean record states, never data.

export const INK = '#1f1d1a'
export const INK_SOFT = '#4a463f'
export const INK_FAINT = '#7a7468'
export const GRID = '#e2dccb'
export const DATA = '#2f5d8a'
export const FONT_FAMILY = 'Atkinson Hyperlegible, sans-serif'

/** Series colours in order: blue-slate first, then accents that stay apart in greyscale too. */
export const SERIES_COLORS = [
  '#2f5d8a', // blue-slate
  '#8a5a2b', // umber
  '#3f7a6a', // sage teal
  '#74497a', // plum
  '#5b6630', // olive
  '#b0762e', // ochre
  '#2d3f5c', // deep navy
  '#8c4a5e', // mulberry
] as const

/**
 * Dash patterns paired with series, so no series is told apart by colour alone
 * (WCAG 1.4.1). Empty string is a solid line.
 */
export const SERIES_DASHES = ['', '7 4', '2 3', '10 3 2 3', '4 2', '12 4 2 4 2 4', '1 5', '7 2 7 6'] as const

export function seriesStyle(index: number): { color: string; dash: string } {
  return {
    color: SERIES_COLORS[index % SERIES_COLORS.length]!,
    // Past eight, offset the dash cycle so colour and dash do not repeat together.
    dash: SERIES_DASHES[(index + Math.floor(index / SERIES_DASHES.length)) % SERIES_DASHES.length]!,
  }
}

// Cool-to-warm stops for temperatures: slate blue through a pale neutral to a brick-free
// warm copper. Every stop is dark enough for a 1.5 px line on paper (contrast >= 3:1 with
// #fbf8f1), so the middle of the scale does not vanish.
const temperatureStops: Array<[number, [number, number, number]]> = [
  [0, [0x2b, 0x4c, 0x8c]], // cold: deep blue
  [0.3, [0x3d, 0x7e, 0x9e]], // cool: steel teal
  [0.5, [0x6e, 0x6a, 0x5e]], // middle: warm grey
  [0.7, [0xa8, 0x6a, 0x2e]], // warm: copper
  [1, [0x9a, 0x3d, 0x1c]], // hot: burnt orange
]

function hex(channel: number): string {
  return Math.round(Math.min(255, Math.max(0, channel))).toString(16).padStart(2, '0')
}

/**
 * Colour for a temperature scaled to 0 (coldest series) … 1 (hottest). Use only when the
 * series are different temperatures. Values outside 0…1 are clamped; NaN is the middle.
 */
export function temperatureColor(t01: number): string {
  const t = Number.isFinite(t01) ? Math.min(1, Math.max(0, t01)) : Number.isNaN(t01) ? 0.5 : t01 > 0 ? 1 : 0
  for (let index = 1; index < temperatureStops.length; index++) {
    const [position, color] = temperatureStops[index]!
    const [previousPosition, previousColor] = temperatureStops[index - 1]!
    if (t <= position) {
      const f = (t - previousPosition) / (position - previousPosition)
      return `#${[0, 1, 2].map((c) => hex(previousColor[c]! + f * (color[c]! - previousColor[c]!))).join('')}`
    }
  }
  const last = temperatureStops[temperatureStops.length - 1]![1]
  return `#${last.map(hex).join('')}`
}
