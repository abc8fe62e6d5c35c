// Short, readable numbers: a few significant digits, a true minus sign, and powers of ten
// for very small or very large magnitudes. Two forms of the same number: `parts` for SVG
// (the exponent drawn as a raised tspan, because Atkinson Hyperlegible has no glyphs for
// most Unicode superscripts) and `formatNumber` text with Unicode superscripts for alt
// text and tables.

export const MINUS = '\u2212'
const superscriptDigits: Record<string, string> = {
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '-': '⁻', [MINUS]: '⁻',
}

/** A number split for display: `mantissa × 10^exponent`, or just `mantissa`. */
export interface NumberParts {
  /** Leading text, e.g. "2.5×10", "10", "0.25"; "" never. */
  base: string
  /** Exponent drawn raised after `base`, e.g. "−5"; undefined when there is none. */
  exponent?: string
}

export function toSuperscript(text: string): string {
  return Array.from(text, (character) => superscriptDigits[character] ?? character).join('')
}

/** Joins parts into plain text with Unicode superscripts ("2.5×10⁻⁵"). */
export function partsToText(parts: NumberParts): string {
  return parts.exponent === undefined ? parts.base : parts.base + toSuperscript(parts.exponent)
}

function withMinus(text: string): string {
  return text.replace(/^-/, MINUS)
}

/** Trims trailing zeros from a fixed or precision string ("1.500" -> "1.5", "2.00" -> "2"). */
function trimZeros(text: string): string {
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text
}

/** Display range in which plain decimals are used; outside it, powers of ten. */
const SMALLEST_PLAIN = 1e-3
const LARGEST_PLAIN = 1e5

function powerParts(mantissa: string, exponent: number): NumberParts {
  const sign = mantissa.startsWith(MINUS) ? MINUS : ''
  const unsigned = sign ? mantissa.slice(1) : mantissa
  const exponentText = withMinus(String(exponent))
  return { base: unsigned === '1' ? `${sign}10` : `${mantissa}×10`, exponent: exponentText }
}

/**
 * A finite number with `significantDigits` significant digits (default 3). Non-finite
 * values give "—" so that nothing reads as a number.
 */
export function numberParts(value: number, significantDigits = 3): NumberParts {
  if (!Number.isFinite(value)) return { base: '—' }
  if (value === 0) return { base: '0' }
  const magnitude = Math.abs(value)
  // toExponential does the rounding once, so 9.996e-4 becomes 1.00e-3, not "10×10⁻⁴".
  const [mantissaText, exponentText] = value.toExponential(Math.max(0, significantDigits - 1)).split('e')
  const exponent = Number(exponentText)
  const rounded = Number(`${mantissaText}e${exponent}`)
  if (Math.abs(rounded) >= SMALLEST_PLAIN && Math.abs(rounded) < LARGEST_PLAIN && magnitude >= SMALLEST_PLAIN / 2) {
    return { base: withMinus(trimZeros(rounded.toFixed(Math.max(0, significantDigits - 1 - exponent)))) }
  }
  return powerParts(withMinus(trimZeros(mantissaText!)), exponent)
}

/** Plain text of `numberParts` ("0.25", "1.2×10⁻⁸", "−3"). */
export function formatNumber(value: number, significantDigits = 3): string {
  return partsToText(numberParts(value, significantDigits))
}

/**
 * A positive quantity known only by its base-10 logarithm (populations below 1e-308 are
 * reported this way), e.g. -400.3 -> "5.0×10⁻⁴⁰¹".
 */
export function log10Parts(log10Value: number, significantDigits = 3): NumberParts {
  if (!Number.isFinite(log10Value)) return log10Value === -Infinity ? { base: '0' } : { base: '—' }
  if (log10Value > -300 && log10Value < 300) return numberParts(10 ** log10Value, significantDigits)
  let exponent = Math.floor(log10Value)
  let mantissa = Number((10 ** (log10Value - exponent)).toPrecision(significantDigits))
  if (mantissa >= 10) {
    mantissa /= 10
    exponent += 1
  }
  return powerParts(trimZeros(mantissa.toPrecision(significantDigits)), exponent)
}

export function formatFromLog10(log10Value: number, significantDigits = 3): string {
  return partsToText(log10Parts(log10Value, significantDigits))
}

/**
 * Labels for a set of evenly spaced tick values: enough decimals to tell neighbours apart,
 * powers of ten outside 10⁻³…10⁵ (with a shared mantissa precision).
 */
export function tickParts(values: number[]): NumberParts[] {
  if (values.length === 0) return []
  const finite = values.filter(Number.isFinite)
  const largest = Math.max(...finite.map(Math.abs))
  const step = finite.length > 1 ? Math.abs(finite[1]! - finite[0]!) : largest || 1
  if (largest === 0) return values.map(() => ({ base: '0' }))
  const largestExponent = Math.floor(Math.log10(largest))
  const stepExponent = Math.floor(Math.log10(step))
  if (largest >= LARGEST_PLAIN || largest < SMALLEST_PLAIN) {
    // Mantissa digits: enough to resolve one step at the largest value's exponent.
    const digits = Math.min(6, Math.max(1, largestExponent - stepExponent + 1))
    return values.map((value) => {
      if (value === 0) return { base: '0' }
      const exponent = Math.floor(Math.log10(Math.abs(value)) + 1e-9)
      return numberParts(value, Math.max(1, digits - (largestExponent - exponent)))
    })
  }
  const decimals = Math.min(12, Math.max(0, -stepExponent + (step / 10 ** stepExponent % 1 > 1e-6 ? 1 : 0)))
  return values.map((value) => ({ base: withMinus(value.toFixed(decimals)).replace(/^−(0\.?0*)$/, '$1') }))
}
