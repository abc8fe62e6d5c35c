import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  boltzmannPlotChart, distributionChart, populationChart, sweepChart, temperatureColor, type ChartOutput,
} from '../../../shared/charts'
import { boltzmannExample, distributionExample, populationExample, sweepExample, vibrationalLevels } from './examples'
import { allElements, parseXml, textContent, type XmlElement } from './svg-check'

// What pdfmake's SVG support reads: basic elements and inline presentation attributes.
const allowedElements = new Set(['svg', 'g', 'line', 'rect', 'path', 'circle', 'text', 'title', 'desc', 'tspan'])
const allowedAttributes = new Set([
  'xmlns', 'width', 'height', 'viewBox', 'role', 'x', 'y', 'x1', 'y1', 'x2', 'y2', 'cx', 'cy', 'r', 'd', 'dy',
  'fill', 'stroke', 'stroke-width', 'stroke-dasharray', 'stroke-linejoin', 'font-size', 'font-family',
  'font-weight', 'font-variant', 'text-anchor',
])

/** Structural checks every chart must pass; returns the parsed tree. */
function checkSvg(output: ChartOutput): XmlElement {
  const root = parseXml(output.svg)
  expect(root.name).toBe('svg')
  expect(root.attributes.xmlns).toBe('http://www.w3.org/2000/svg')
  expect(root.attributes.role).toBe('img')
  expect(root.attributes.viewBox).toMatch(/^0 0 \d+(\.\d)? \d+(\.\d)?$/)
  expect(root.attributes['font-family']).toBe('Atkinson Hyperlegible, sans-serif')
  expect(root.children[0]!.name).toBe('title')
  expect(root.children[1]!.name).toBe('desc')
  // The description is the alt text, less characters XML cannot hold.
  expect(root.children[1]!.text).toBe(output.alt.replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F]|[\uD800-\uDFFF]/g, ''))
  expect(output.svg).not.toMatch(/NaN|Infinity|undefined|null/)
  for (const element of allElements(root)) {
    expect(allowedElements, element.name).toContain(element.name)
    for (const [name, value] of Object.entries(element.attributes)) {
      expect(allowedAttributes, name).toContain(name)
      if (/^(x|y|x1|y1|x2|y2|cx|cy|r|dy|width|height|stroke-width|font-size)$/.test(name)) {
        expect(Number.isFinite(Number(value)), `${element.name} ${name}="${value}"`).toBe(true)
        // Coordinates rounded to 0.1 px keep the SVG compact.
        expect(value).toMatch(/^-?\d+(\.\d)?$/)
      }
    }
    if (element.name === 'text') expect(Number(element.attributes['font-size'])).toBeGreaterThanOrEqual(11)
    if (element.name === 'tspan') expect(Number(element.attributes['font-size'])).toBeGreaterThanOrEqual(11)
  }
  const sentences = output.alt.split(/(?<=\.)\s+(?=[A-Z0-9])/)
  expect(sentences.length).toBeGreaterThanOrEqual(1)
  expect(sentences.length).toBeLessThanOrEqual(3)
  return root
}

const texts = (root: XmlElement) => allElements(root).filter((element) => element.name === 'text').map(textContent)

const hostile = `<script>alert("x")</script> & 'quoted' <img src=x onerror=alert(1)>`

describe('populationChart', () => {
  it('draws bars in energy order with axis titles, and names the most populated level', () => {
    const shuffled = { ...populationExample, levels: [...populationExample.levels].reverse() }
    const output = populationChart(shuffled, { title: 'CO at 2500 K' })
    const root = checkSvg(output)
    expect(root.children[0]!.text).toBe('CO at 2500 K')
    expect(allElements(root).filter((element) => element.name === 'rect')).toHaveLength(8)
    const labels = texts(root)
    expect(labels).toContain('Population fraction')
    expect(labels).toContain('Level and its energy (cm⁻¹)')
    expect(labels.indexOf('v = 0')).toBeLessThan(labels.indexOf('v = 7'))
    expect(output.alt).toMatch(/most populated level is v = 0/)
    expect(output.table.headers).toEqual(['Level', 'Energy (cm⁻¹)', 'Fraction', 'log10 fraction'])
    expect(output.table.rows[0]![0]).toBe('v = 0')
  })

  it('plots populations below the smallest double on the log scale from log10Fraction', () => {
    const levels = [
      { label: 'ground', energy: 0, fraction: 1, log10Fraction: 0 },
      { label: 'excited', energy: 50000, fraction: 0, log10Fraction: -400.5 },
    ]
    const output = populationChart({ levels, energyUnit: 'cm⁻¹', scale: 'log' })
    const root = checkSvg(output)
    expect(allElements(root).filter((element) => element.name === 'rect')).toHaveLength(2)
    expect(texts(root)).toContain('Population fraction (log scale)')
    expect(texts(root).some((label) => /^10−\d00$/.test(label))).toBe(true)
    expect(output.table.rows[1]![2]).toBe('3.162×10⁻⁴⁰¹')
    expect(output.alt).toMatch(/least is excited with 3\.16×10⁻⁴⁰¹/)
  })

  it('switches to stems at each energy for long ladders', () => {
    const output = populationChart({ levels: vibrationalLevels(3000, 40), energyUnit: 'cm⁻¹', scale: 'log' })
    const root = checkSvg(output)
    expect(allElements(root).filter((element) => element.name === 'circle')).toHaveLength(40)
    expect(texts(root)).toContain('Level energy (cm⁻¹)')
  })

  it('skips non-finite levels and says so', () => {
    const levels = [...populationExample.levels, { label: 'broken', energy: NaN, fraction: NaN, log10Fraction: NaN }]
    const output = populationChart({ ...populationExample, levels })
    checkSvg(output)
    expect(output.alt).toMatch(/1 level is not plotted/)
    expect(output.table.rows).toHaveLength(9)
  })

  it('handles a single level and all-equal populations', () => {
    checkSvg(populationChart({ levels: [{ label: 'only', energy: 0, fraction: 1, log10Fraction: 0 }], energyUnit: 'K', scale: 'log' }))
    const equal = [0, 1, 2].map((i) => ({ label: `L${i}`, energy: 0, fraction: 1 / 3, log10Fraction: Math.log10(1 / 3) }))
    checkSvg(populationChart({ levels: equal, energyUnit: 'K', scale: 'linear' }))
    checkSvg(populationChart({ levels: equal, energyUnit: 'K', scale: 'log' }))
  })
})

describe('sweepChart', () => {
  it('draws one dashed-or-solid line per series with a legend, gaps for null', () => {
    const output = sweepChart(sweepExample)
    const root = checkSvg(output)
    const paths = allElements(root).filter((element) => element.name === 'path')
    expect(paths).toHaveLength(3)
    // The series with a gap is one path of two pieces.
    expect(paths[1]!.attributes.d!.match(/M/g)).toHaveLength(2)
    const dashes = new Set(paths.map((path) => path.attributes['stroke-dasharray'] ?? 'solid'))
    expect(dashes.size).toBe(3)
    const labels = texts(root)
    for (const series of sweepExample.series) expect(labels).toContain(series.name)
    expect(labels).toContain('Temperature (K)')
    expect(labels).toContain('Upper-level fraction')
  })

  it('gives eight series distinct colour-and-dash pairs', () => {
    const x = [1, 2, 3]
    const series = Array.from({ length: 8 }, (_, i) => ({ name: `s${i}`, values: x.map((v) => v * (i + 1)) }))
    const root = checkSvg(sweepChart({ x, xLabel: 'x', xUnit: '', yLabel: 'y', series }))
    const paths = allElements(root).filter((element) => element.name === 'path')
    const dashes = new Set(paths.map((path) => path.attributes['stroke-dasharray'] ?? 'solid'))
    expect(dashes.size).toBe(8)
  })

  it('colours temperature series cool to warm', () => {
    const x = [100, 200, 300]
    const series = [300, 1000, 3000].map((t) => ({ name: `${t} K`, temperature: t, values: x.map((v) => Math.exp(-v / t)) }))
    const root = checkSvg(sweepChart({ x, xLabel: 'Energy', xUnit: 'K', yLabel: 'Fraction', series }))
    const strokes = allElements(root).filter((element) => element.name === 'path').map((path) => path.attributes.stroke)
    expect(strokes[0]).toBe(temperatureColor(0))
    expect(strokes[2]).toBe(temperatureColor(1))
  })

  it('uses power-of-ten ticks on log axes and skips non-positive values', () => {
    const x = [0, 1, 10, 100, 1000]
    const output = sweepChart({
      x, xLabel: 'Field', xUnit: 'T', yLabel: 'Polarization', logX: true, logY: true,
      series: [{ name: 'P', values: [1, 1e-1, 1e-3, -1, 1e-6] }],
    })
    const root = checkSvg(output)
    const labels = texts(root)
    expect(labels).toContain('10−6')
    expect(labels).toContain('103')
    expect(output.alt).toMatch(/2 values are not plotted/)
  })

  it('marks a point that has no neighbours', () => {
    const root = checkSvg(sweepChart({ x: [1, 2, 3], xLabel: 'x', xUnit: '', yLabel: 'y', series: [{ name: 'a', values: [null, 2, null] }] }))
    expect(allElements(root).filter((element) => element.name === 'circle').length).toBeGreaterThanOrEqual(1)
  })
})

describe('boltzmannPlotChart', () => {
  it('draws points with error bars, the fit and a residual panel on the same energy axis', () => {
    const output = boltzmannPlotChart(boltzmannExample)
    const root = checkSvg(output)
    const labels = texts(root)
    expect(labels).toContain('ln(Iλ/gA)')
    expect(labels).toContain('Residual (ln(Iλ/gA) − fit)')
    expect(labels).toContain('Energy (cm⁻¹)')
    // 8 points above, 8 residuals below, 1 key marker.
    expect(allElements(root).filter((element) => element.name === 'circle')).toHaveLength(17)
    // The residual zero line.
    expect(output.svg).toContain('stroke-dasharray="4 3"')
    expect(output.alt).toMatch(/residual panel/)
    expect(output.alt).toMatch(/largest residual is 0\.15 at 27170 cm⁻¹ \(Fe I 3737\.1 Å\)/)
    expect(output.table.headers).toEqual(['Line', 'Energy (cm⁻¹)', 'ln(Iλ/gA)', 'Uncertainty', 'Fit', 'Residual'])
  })

  it('draws the points without a line when the fit is not finite', () => {
    const output = boltzmannPlotChart({ ...boltzmannExample, fit: { slope: NaN, intercept: 1 } })
    checkSvg(output)
    expect(output.alt).toMatch(/No fitted line/)
  })

  it('handles a single line', () => {
    checkSvg(boltzmannPlotChart({ points: [{ energy: 1000, y: -2 }], fit: { slope: 0, intercept: -2 }, energyUnit: 'cm⁻¹', yLabel: 'ln(I/g)', residuals: [0] }))
  })
})

describe('distributionChart', () => {
  it('draws a bar per distribution and names the largest', () => {
    const output = distributionChart(distributionExample)
    const root = checkSvg(output)
    expect(allElements(root).filter((element) => element.name === 'rect')).toHaveLength(9)
    expect(texts(root)).toContain('Microstates W')
    expect(output.alt).toMatch(/largest is 3 2 1 0 with 24/)
  })

  it('prints huge microstate counts with powers of ten', () => {
    const output = distributionChart({ xLabel: 'n', yLabel: 'W', bars: [{ label: 'a', value: 2.4e30 }, { label: 'b', value: 1.2e31 }] })
    const root = checkSvg(output)
    expect(texts(root).some((label) => /×1031|^1031$/.test(label) || /×10\d\d$/.test(label))).toBe(true)
  })

  it('handles all-equal and all-zero bars', () => {
    checkSvg(distributionChart({ xLabel: 'n', yLabel: 'P', bars: [{ label: 'a', value: 0.5 }, { label: 'b', value: 0.5 }] }))
    checkSvg(distributionChart({ xLabel: 'n', yLabel: 'P', bars: [{ label: 'a', value: 0 }, { label: 'b', value: 0 }] }))
  })
})

describe('every chart', () => {
  const empties: Array<[string, () => ChartOutput]> = [
    ['population', () => populationChart({ levels: [], energyUnit: 'cm⁻¹', scale: 'linear' })],
    ['sweep', () => sweepChart({ x: [], xLabel: 'T', xUnit: 'K', yLabel: 'y', series: [] })],
    ['boltzmann', () => boltzmannPlotChart({ points: [], fit: { slope: 0, intercept: 0 }, energyUnit: 'cm⁻¹', yLabel: 'y', residuals: [] })],
    ['distribution', () => distributionChart({ bars: [], xLabel: 'x', yLabel: 'y' })],
  ]
  it.each(empties)('%s: empty data draws a "no data" message', (_, draw) => {
    const output = draw()
    const root = checkSvg(output)
    expect(texts(root)).toContain('No data to plot')
    expect(output.alt).toMatch(/^No data to plot/)
    expect(output.table.rows).toEqual([])
  })

  const hostileCharts: Array<[string, () => ChartOutput]> = [
    ['population', () => populationChart({ levels: [{ label: hostile, energy: 0, fraction: 1, log10Fraction: 0 }], energyUnit: hostile, scale: 'linear' }, { title: hostile })],
    ['sweep', () => sweepChart({ x: [1, 2], xLabel: hostile, xUnit: hostile, yLabel: hostile, series: [{ name: hostile, unit: hostile, values: [1, 2] }] }, { title: hostile })],
    ['boltzmann', () => boltzmannPlotChart({ points: [{ energy: 1, y: 1, label: hostile }, { energy: 2, y: 0 }], fit: { slope: -1, intercept: 2 }, energyUnit: hostile, yLabel: hostile, residuals: [0, 0] }, { title: hostile })],
    ['distribution', () => distributionChart({ bars: [{ label: hostile, value: 1 }], xLabel: hostile, yLabel: hostile }, { title: hostile })],
    ['empty', () => distributionChart({ bars: [], xLabel: hostile, yLabel: hostile }, { title: hostile })],
  ]
  it.each(hostileCharts)('%s: markup in caller text is escaped and shows as text', (_, draw) => {
    const output = draw()
    const root = checkSvg(output)
    expect(output.svg).not.toContain('<script')
    expect(output.svg).not.toContain('<img')
    expect(output.svg).toContain('&lt;script&gt;')
    expect(root.children[0]!.text).toBe(hostile)
    // The parsed tree holds only our own elements: the label came through as text.
    expect(allElements(root).some((element) => element.name === 'script' || element.name === 'img')).toBe(false)
  })

  it('drops characters XML cannot hold', () => {
    const output = distributionChart({ bars: [{ label: 'a\u0000b\u0007c\uD800', value: 1 }], xLabel: 'x', yLabel: 'y' })
    const root = checkSvg(output)
    expect(texts(root)).toContain('abc')
  })

  // Property tests: any doubles (NaN, ±Infinity, subnormals, ±1.8e308) give well-formed SVG
  // with finite, compact coordinates.
  const number = fc.oneof(fc.double(), fc.constantFrom(NaN, Infinity, -Infinity, 0, -0, 1e-320, 1.7976931348623157e308))
  const runs = { numRuns: 100 }
  it('population: never writes NaN or Infinity, whatever the numbers', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ label: fc.string({ maxLength: 8 }), energy: number, fraction: number, log10Fraction: number }), { maxLength: 12 }),
      fc.constantFrom<'linear' | 'log'>('linear', 'log'),
      (levels, scale) => { checkSvg(populationChart({ levels, energyUnit: 'cm⁻¹', scale })) },
    ), runs)
  }, 30_000)
  it('sweep: never writes NaN or Infinity, whatever the numbers', () => {
    fc.assert(fc.property(
      fc.array(number, { maxLength: 10 }),
      fc.array(fc.array(fc.option(number), { maxLength: 10 }), { maxLength: 4 }),
      fc.boolean(), fc.boolean(),
      (x, values, logX, logY) => {
        checkSvg(sweepChart({ x, xLabel: 'x', xUnit: 'u', yLabel: 'y', logX, logY, series: values.map((v, i) => ({ name: `s${i}`, values: v })) }))
      },
    ), runs)
  }, 30_000)
  it('boltzmann: never writes NaN or Infinity, whatever the numbers', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ energy: number, y: number, uncertainty: number }), { maxLength: 8 }),
      number, number, fc.array(number, { maxLength: 8 }),
      (points, slope, intercept, residuals) => {
        checkSvg(boltzmannPlotChart({ points, fit: { slope, intercept }, energyUnit: 'cm⁻¹', yLabel: 'ln(I/g)', residuals }))
      },
    ), runs)
  }, 30_000)
  it('distribution: never writes NaN or Infinity, whatever the numbers', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ label: fc.string({ maxLength: 12 }), value: number }), { maxLength: 20 }),
      (bars) => { checkSvg(distributionChart({ bars, xLabel: 'x', yLabel: 'y' })) },
    ), runs)
  }, 30_000)

  it('respects width and height', () => {
    const root = checkSvg(distributionChart(distributionExample, { width: 400, height: 240 }))
    expect(root.attributes.viewBox).toBe('0 0 400 240')
  })
})

describe('temperatureColor', () => {
  it('runs cool to warm and clamps', () => {
    const blueMinusRed = (color: string) => parseInt(color.slice(5, 7), 16) - parseInt(color.slice(1, 3), 16)
    expect(blueMinusRed(temperatureColor(0))).toBeGreaterThan(0)
    expect(blueMinusRed(temperatureColor(1))).toBeLessThan(0)
    expect(temperatureColor(-3)).toBe(temperatureColor(0))
    expect(temperatureColor(7)).toBe(temperatureColor(1))
    expect(temperatureColor(NaN)).toMatch(/^#[0-9a-f]{6}$/)
  })
})
