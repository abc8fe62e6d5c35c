// Chart SVG for pdfkit: the shared charts write units such as "cm⁻¹" and names with Greek
// letters as plain text, which the embedded Atkinson font cannot draw. Each text segment is
// cut into the same runs as the PDF's own text (text.ts) and written back as tspans: raised
// or lowered ordinary characters for superscripts and subscripts, Noto Sans for Greek,
// Cyrillic and CJK (the font-family is the pdfmake family name).
import { textRuns } from './text'

function rewriteSegment(segment: string, size: number): string {
  const runs = textRuns(segment)
  if (typeof runs === 'string') return segment
  const shift = Math.round(size * 0.4 * 10) / 10
  const smaller = Math.round(size * 0.75 * 10) / 10
  let offset = 0
  let out = ''
  for (const run of runs) {
    const target = run.sup ? -shift : run.sub ? shift * 0.6 : 0
    const attributes: string[] = []
    if (target !== offset) attributes.push(`dy="${Math.round((target - offset) * 10) / 10}"`)
    if (run.sup || run.sub) attributes.push(`font-size="${smaller}"`)
    if (run.font) attributes.push(`font-family="${run.font}"`)
    offset = target
    out += attributes.length ? `<tspan ${attributes.join(' ')}>${run.text}</tspan>` : run.text
  }
  return out
}

/** The SVG with every text segment made drawable by the embedded fonts. */
export function svgForPdf(svg: string): string {
  return svg.replace(/<text\b([^>]*)>([\s\S]*?)<\/text>/g, (_whole, attributes: string, inner: string) => {
    const size = Number(/font-size="([\d.]+)"/.exec(attributes)?.[1] ?? 11)
    const rewritten = inner.split(/(<[^>]+>)/).map(part => (part.startsWith('<') || part === '' ? part : rewriteSegment(part, size))).join('')
    return `<text${attributes}>${rewritten}</text>`
  })
}
