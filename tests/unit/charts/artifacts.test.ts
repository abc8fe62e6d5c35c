// Renders one example of each chart to test-artifacts/charts/*.svg (gitignored) for a
// person to look at; convert with `rsvg-convert -b white -z 1.5 x.svg -o x.png`.
import { mkdirSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { it } from 'vitest'
import { boltzmannPlotChart, distributionChart, populationChart, sweepChart, type ChartOutput } from '../../../shared/charts'
import { boltzmannExample, distributionExample, populationExample, sweepExample, vibrationalLevels } from './examples'
import { parseXml } from './svg-check'

const directory = fileURLToPath(new URL('../../../test-artifacts/charts/', import.meta.url))
const temperatures = [10, 50, 100, 300, 1000, 3000, 6000, 10000]
const energies = [1, 2, 3, 5, 10, 20, 50, 100, 200, 500, 1000]

const examples: Record<string, () => ChartOutput> = {
  'population-linear': () => populationChart(populationExample, { title: 'CO vibrational populations at 2500 K' }),
  'population-log': () => populationChart({ ...populationExample, levels: vibrationalLevels(300, 12), scale: 'log' }),
  'population-energy': () => populationChart({ ...populationExample, levels: vibrationalLevels(3000, 40), scale: 'log' }),
  sweep: () => sweepChart(sweepExample, { title: 'Two-level populations' }),
  'sweep-temperatures': () => sweepChart({
    x: energies, xLabel: 'Energy', xUnit: 'cm⁻¹', yLabel: 'Boltzmann factor', logX: true, logY: true,
    series: temperatures.map((t) => ({ name: `${t} K`, temperature: t, values: energies.map((e) => Math.exp((-e * 1.438776877) / t)) })),
  }),
  boltzmann: () => boltzmannPlotChart(boltzmannExample, { title: 'Excitation temperature from Fe I lines' }),
  distribution: () => distributionChart(distributionExample),
  'distribution-small': () => distributionChart(distributionExample, { width: 400, height: 240 }),
  empty: () => sweepChart({ x: [], xLabel: 'T', xUnit: 'K', yLabel: 'y', series: [] }, { title: 'A sweep with no data' }),
  escaped: () => distributionChart({ bars: [{ label: '<script>alert("x")</script>', value: 1 }, { label: 'a & b', value: 2 }], xLabel: '<b>not bold</b>', yLabel: "it's" }),
}

it('renders one example of each chart to test-artifacts/charts', () => {
  mkdirSync(directory, { recursive: true })
  for (const [name, draw] of Object.entries(examples)) {
    const { svg } = draw()
    parseXml(svg)
    writeFileSync(`${directory}${name}.svg`, svg)
  }
})
