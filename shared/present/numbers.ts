/**
 * Numbers as a scientist writes them. With an uncertainty: the uncertainty to two significant
 * figures and the value to the same decimal place (JCGM 100:2008, GUM §7.2.6: "at most two
 * significant digits"), `2987 ± 41`. Without: the person's significant figures (six by default,
 * 4–10), trailing zeros kept because they are significant. Powers of ten outside 10⁻³…10⁶,
 * a true minus sign. Full precision stays in the bundle, the CSV and the copy action.
 */

export const MINUS = '\u2212'
export const DEFAULT_SIGNIFICANT_FIGURES = 6
export const SIGNIFICANT_FIGURES_RANGE = { min: 4, max: 10 } as const

const SUPERSCRIPTS: Record<string, string> = { '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '-': '⁻' }
const superscript = (text: string) => Array.from(text, (character) => SUPERSCRIPTS[character] ?? character).join('')
const minus = (text: string) => text.replace(/^-/, MINUS)

/** Plain decimals for magnitudes in [SMALLEST_PLAIN, LARGEST_PLAIN), powers of ten outside. */
const SMALLEST_PLAIN = 1e-3
const LARGEST_PLAIN = 1e6

/** Significant figures clamped to the allowed range (a bad setting never breaks a page). */
export function significantFigures(value: number | undefined): number {
  if (value === undefined || !Number.isFinite(value)) return DEFAULT_SIGNIFICANT_FIGURES
  return Math.min(SIGNIFICANT_FIGURES_RANGE.max, Math.max(SIGNIFICANT_FIGURES_RANGE.min, Math.round(value)))
}

/** A number to `digits` significant figures: '0.398382', '2.50000×10⁻⁵', '−3.00000'. Non-finite: '—'. */
export function formatSignificant(value: number, digits = DEFAULT_SIGNIFICANT_FIGURES): string {
  if (!Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const [mantissa, exponentText] = value.toExponential(digits - 1).split('e')
  const exponent = Number(exponentText)
  const rounded = Math.abs(Number(`${mantissa}e${exponent}`))
  if (rounded >= SMALLEST_PLAIN && rounded < LARGEST_PLAIN) return minus(value.toFixed(Math.max(0, digits - 1 - exponent)))
  return `${minus(mantissa!)}×10${superscript(String(exponent))}`
}

/** A whole number exactly as it is (exact microstate counts can run to hundreds of digits). */
export function formatInteger(value: number | bigint | string): string {
  return String(value).replace(/^-/, MINUS)
}

/** A positive number known only by its base-10 logarithm: '5.01187×10⁻⁴⁰¹'. */
export function formatFromLog10(log10Value: number, digits = DEFAULT_SIGNIFICANT_FIGURES): string {
  if (log10Value === -Infinity) return '0'
  if (!Number.isFinite(log10Value)) return '—'
  if (log10Value > -300 && log10Value < 300) return formatSignificant(10 ** log10Value, digits)
  let exponent = Math.floor(log10Value)
  let mantissa = Number((10 ** (log10Value - exponent)).toPrecision(digits))
  if (mantissa >= 10) {
    mantissa /= 10
    exponent += 1
  }
  return `${mantissa.toFixed(digits - 1)}×10${superscript(String(exponent))}`
}

export interface ValueWithUncertainty {
  /** The value rounded to the uncertainty's last digit. */
  value: string
  /** The uncertainty to two significant figures. */
  uncertainty: string
  /** Shared power of ten ('×10⁻⁵') when the pair is written in scientific notation, else ''. */
  power: string
  /** The whole as one string: '2987 ± 41', '(1.234 ± 0.056)×10⁻⁵'. */
  text: string
}

/**
 * Value and standard uncertainty rounded together (GUM §7.2.6): u to two significant figures,
 * x to the same decimal place. A zero or missing uncertainty falls back to significant figures.
 */
export function formatWithUncertainty(value: number, uncertainty: number, digits = DEFAULT_SIGNIFICANT_FIGURES): ValueWithUncertainty {
  if (!Number.isFinite(value) || !Number.isFinite(uncertainty) || uncertainty <= 0) {
    const text = formatSignificant(value, digits)
    return { value: text, uncertainty: '', power: '', text }
  }
  // The place of the uncertainty's second significant digit; 99.5 rounds up to 100, one place left.
  let place = Math.floor(Math.log10(uncertainty)) - 1
  if (Math.round(uncertainty / 10 ** place) >= 100) place += 1
  const roundTo = (number: number) => Math.round(number / 10 ** place) * 10 ** place
  const roundedUncertainty = roundTo(uncertainty)
  const roundedValue = roundTo(value)
  const largest = Math.max(Math.abs(roundedValue), roundedUncertainty)
  if (largest >= SMALLEST_PLAIN && largest < LARGEST_PLAIN && place > -10) {
    const decimals = Math.max(0, -place)
    const valueText = minus(roundedValue.toFixed(decimals)).replace(/^−(0\.?0*)$/, '$1')
    const uncertaintyText = roundedUncertainty.toFixed(decimals)
    return { value: valueText, uncertainty: uncertaintyText, power: '', text: `${valueText} ± ${uncertaintyText}` }
  }
  const exponent = Math.floor(Math.log10(largest))
  const decimals = Math.max(0, exponent - place)
  const scale = (number: number) => number / 10 ** exponent
  const valueText = minus(scale(roundedValue).toFixed(decimals))
  const uncertaintyText = scale(roundedUncertainty).toFixed(decimals)
  const power = `×10${superscript(String(exponent))}`
  return { value: valueText, uncertainty: uncertaintyText, power, text: `(${valueText} ± ${uncertaintyText})${power}` }
}
