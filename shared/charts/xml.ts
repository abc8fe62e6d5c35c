// Building SVG as strings: one escaping function for every caller-supplied text, and
// element helpers that refuse non-finite coordinates so NaN or Infinity never reaches
// an attribute.

// Characters XML 1.0 does not allow at all (C0 controls except tab, LF, CR; U+FFFE/U+FFFF;
// lone surrogates). They cannot be escaped, only dropped.
const forbiddenXmlCharacters =
  /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g

const xmlEntities: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&apos;',
}

/** Escapes text for XML content and attribute values (the five predefined entities). */
export function escapeXml(text: string): string {
  return String(text)
    .replace(forbiddenXmlCharacters, '')
    .replace(/[&<>"']/g, (character) => xmlEntities[character]!)
}

// Far outside any drawing; clamping keeps wild data from printing as 1e+21.
const COORDINATE_LIMIT = 1e5

/** Rounds a coordinate to 0.1 user unit and prints it without a trailing ".0". */
export function coordinate(value: number): string {
  const clamped = Math.min(COORDINATE_LIMIT, Math.max(-COORDINATE_LIMIT, value))
  const rounded = Math.round(clamped * 10) / 10
  return Object.is(rounded, -0) ? '0' : String(rounded)
}

export type AttributeValue = string | number | undefined

/**
 * Serialises attributes; numbers are rounded to 0.1. Returns null when a number is not
 * finite, so the caller drops the whole element instead of writing NaN.
 */
export function attributes(values: Record<string, AttributeValue>): string | null {
  let out = ''
  for (const [name, value] of Object.entries(values)) {
    if (value === undefined) continue
    if (typeof value === 'number') {
      if (!Number.isFinite(value)) return null
      out += ` ${name}="${coordinate(value)}"`
    } else {
      out += ` ${name}="${escapeXml(value)}"`
    }
  }
  return out
}

/** An element; empty string if any numeric attribute is not finite. */
export function element(
  name: string,
  values: Record<string, AttributeValue>,
  content?: string,
): string {
  const serialised = attributes(values)
  if (serialised === null) return ''
  return content === undefined ? `<${name}${serialised}/>` : `<${name}${serialised}>${content}</${name}>`
}

/** Path data from points; non-finite points are dropped. */
export function pathData(points: Array<[number, number]>): string {
  let out = ''
  for (const [x, y] of points) {
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue
    out += `${out ? 'L' : 'M'}${coordinate(x)},${coordinate(y)}`
  }
  return out
}
