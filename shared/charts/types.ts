/** Options every chart function accepts. */
export interface ChartOptions {
  /** Width of the drawing in SVG user units (CSS px at 1:1); default 640. */
  width?: number
  /** Height of the drawing in SVG user units; default 320. */
  height?: number
  /** Title shown above the chart and used as the SVG <title>. */
  title?: string
}

/** A plain-text table of what the chart shows, for screen readers and the PDF. */
export interface ChartTable {
  headers: string[]
  rows: string[][]
}

/**
 * What every chart function returns: the same SVG for the browser (v-html) and for
 * pdfmake's `svg` node, a one-to-three sentence text alternative, and the data as a table.
 */
export interface ChartOutput {
  svg: string
  alt: string
  table: ChartTable
}
