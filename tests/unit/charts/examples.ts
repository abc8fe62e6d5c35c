// Realistic inputs for the charts, shared by the tests and the rendered artifacts.
import type { BoltzmannPlotData, DistributionChartData, PopulationChartData, SweepChartData } from '../../../shared/charts'

const SECOND_RADIATION_CONSTANT = 1.438776877 // cm·K, c₂ = hc/k (CODATA 2018)

/** Vibrational ladder of CO (ωₑ ≈ 2169.8 cm⁻¹, harmonic) at `temperature` kelvin. */
export function vibrationalLevels(temperature: number, count = 8): PopulationChartData['levels'] {
  const energies = Array.from({ length: count }, (_, v) => 2169.8 * (v + 0.5))
  const exponents = energies.map((energy) => -(energy - energies[0]!) * SECOND_RADIATION_CONSTANT / temperature)
  const peak = Math.max(...exponents)
  const log10Sum = (peak + Math.log(exponents.reduce((sum, e) => sum + Math.exp(e - peak), 0))) / Math.LN10
  return energies.map((energy, v) => {
    const log10Fraction = exponents[v]! / Math.LN10 - log10Sum
    return { label: `v = ${v}`, energy, fraction: 10 ** log10Fraction, log10Fraction }
  })
}

export const populationExample: PopulationChartData = {
  levels: vibrationalLevels(2500),
  energyUnit: 'cm⁻¹',
  scale: 'linear',
}

/** Fraction in the upper of two levels 1 kT apart … ; three level schemes against T. */
export const sweepExample: SweepChartData = (() => {
  const x = Array.from({ length: 40 }, (_, i) => 50 + i * 50)
  const gaps = [500, 1000, 2000]
  return {
    x,
    xLabel: 'Temperature',
    xUnit: 'K',
    yLabel: 'Upper-level fraction',
    series: gaps.map((gap, index) => ({
      name: `ΔE = ${gap} cm⁻¹`,
      values: x.map((t, i) => (index === 1 && i >= 10 && i < 14 ? null : 1 / (1 + Math.exp((gap * SECOND_RADIATION_CONSTANT) / t)))),
    })),
  }
})()

/** Fe I lines at T = 6000 K with a little scatter. */
export const boltzmannExample: BoltzmannPlotData = (() => {
  const temperature = 6000
  const slope = -SECOND_RADIATION_CONSTANT / temperature // per cm⁻¹
  const intercept = 2.3
  const scatter = [0.08, -0.12, 0.05, 0.15, -0.06, -0.1, 0.02, 0.11]
  const energies = [19350, 22650, 25900, 27170, 29730, 33100, 35760, 38170]
  const points = energies.map((energy, index) => ({
    energy,
    y: slope * energy + intercept + scatter[index]!,
    uncertainty: 0.08 + 0.02 * (index % 3),
    label: `Fe I ${[3719.9, 3440.6, 3581.2, 3737.1, 3859.9, 4045.8, 4383.5, 4404.8][index]} Å`,
  }))
  return { points, fit: { slope, intercept }, energyUnit: 'cm⁻¹', yLabel: 'ln(Iλ/gA)', residuals: scatter }
})()

/** Microstates W = N!/Π nᵢ! of 6 quanta over 4 oscillators, by distribution. */
export const distributionExample: DistributionChartData = {
  xLabel: 'Distribution (n₀ n₁ n₂ n₃)',
  yLabel: 'Microstates W',
  bars: [
    { label: '6 0 0 0', value: 4 }, { label: '5 1 0 0', value: 12 }, { label: '4 2 0 0', value: 12 },
    { label: '4 1 1 0', value: 12 }, { label: '3 3 0 0', value: 6 }, { label: '3 2 1 0', value: 24 },
    { label: '3 1 1 1', value: 4 }, { label: '2 2 2 0', value: 4 }, { label: '2 2 1 1', value: 6 },
  ],
}
