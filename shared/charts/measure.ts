// Text width estimates for layout. There is no DOM to measure with (the same code runs in
// Node for the PDF), so widths come from Atkinson Hyperlegible's advance widths (em units,
// taken from the shipped @fontsource font with tabular figures on), which is close enough to
// keep labels from overlapping. Unknown characters count as a wide-ish 0.62 em.

const advance: Record<string, number> = {
  ' ': 0.28, '!': 0.28, '"': 0.3, '#': 0.66, $: 0.59, '%': 0.93, '&': 0.71, "'": 0.16, '(': 0.3, ')': 0.3,
  '*': 0.43, '+': 0.6, ',': 0.21, '-': 0.37, '.': 0.21, '/': 0.38, ':': 0.21, ';': 0.21, '<': 0.55, '=': 0.6,
  '>': 0.55, '?': 0.52, '@': 0.78, A: 0.63, B: 0.62, C: 0.66, D: 0.67, E: 0.57, F: 0.55, G: 0.71, H: 0.69,
  I: 0.41, J: 0.51, K: 0.63, L: 0.54, M: 0.82, N: 0.69, O: 0.73, P: 0.6, Q: 0.75, R: 0.62, S: 0.6, T: 0.56,
  U: 0.69, V: 0.59, W: 0.84, X: 0.62, Y: 0.6, Z: 0.61, '[': 0.32, '\\': 0.38, ']': 0.32, '^': 0.55, _: 0.4,
  '`': 0.27, a: 0.53, b: 0.57, c: 0.5, d: 0.56, e: 0.54, f: 0.31, g: 0.56, h: 0.55, i: 0.28, j: 0.25, k: 0.49,
  l: 0.24, m: 0.84, n: 0.55, o: 0.55, p: 0.57, q: 0.58, r: 0.34, s: 0.47, t: 0.32, u: 0.54, v: 0.44, w: 0.65,
  x: 0.46, y: 0.43, z: 0.46, '{': 0.32, '|': 0.23, '}': 0.32, '~': 0.56, '−': 0.6, '×': 0.53, '·': 0.21,
  '—': 0.9, '…': 0.7, '⁻': 0.4, '¹': 0.4, '²': 0.4, '³': 0.4, '⁰': 0.4, '⁴': 0.4, '⁵': 0.4, '⁶': 0.4,
  '⁷': 0.4, '⁸': 0.4, '⁹': 0.4,
}
const DIGIT_ADVANCE = 0.64 // tabular figures
const UNKNOWN_ADVANCE = 0.62

export function textWidth(text: string, fontSize: number): number {
  let width = 0
  for (const character of text) {
    width += character >= '0' && character <= '9' ? DIGIT_ADVANCE : advance[character] ?? UNKNOWN_ADVANCE
  }
  return width * fontSize
}

/** Shortens text with an ellipsis so it fits `maxWidth`; whole code points only. */
export function truncateText(text: string, fontSize: number, maxWidth: number): string {
  if (textWidth(text, fontSize) <= maxWidth) return text
  const characters = Array.from(text)
  while (characters.length > 0 && textWidth(`${characters.join('')}…`, fontSize) > maxWidth) characters.pop()
  return characters.length === 0 ? '' : `${characters.join('').trimEnd()}…`
}
