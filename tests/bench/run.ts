/**
 * Engine benchmarks (`npm run bench`). Not timed tests: prints median and p95 per case after a
 * warm-up and compares them with the targets from issue 3: a 10^6-level `levels` evaluation
 * within 20 ms, and every block at sizes a person types within 16 ms.
 */
import { evaluate, levelPopulations } from '../../shared/thermo/index'

interface Case {
  name: string
  target: number | null
  request: () => { kind: string; input: unknown }
  runs: number
  /** Runs before timing; by default a fifth of the runs, at least 2 and at most 10. */
  warmUp?: number
  /** Runs something other than evaluate (the typed-array bulk path). */
  direct?: () => unknown
}

function levelRows(count: number) {
  return Array.from({ length: count }, (_, index) => ({ energy: `${(index * 1.7).toFixed(2)} cm^-1`, degeneracy: 1 + (index % 3) }))
}

const million = 1_000_000
const millionEnergies = Array.from({ length: million }, (_, index) => index * 0.05)
const millionDegeneracies = Array.from({ length: million }, (_, index) => 1 + (index % 5))
const millionJoules = Float64Array.from(millionEnergies, (value) => value * 1.986445857e-23)
const millionDegeneracyArray = Float64Array.from(millionDegeneracies)
const rows5000 = levelRows(5000)
const rowsMillion = process.argv.includes('--with-text-million') ? levelRows(million) : null

const modes150 = Array.from({ length: 150 }, (_, index) => ({ wavenumber: `${(60 + index * 22.5).toFixed(1)} cm^-1`, degeneracy: 1 }))
const thermochemistry150 = {
  molarMass: '300.4 g/mol',
  shape: 'nonlinear',
  rotationalConstants: ['0.012 cm^-1', '0.008 cm^-1', '0.005 cm^-1'],
  symmetryNumber: 1,
  vibrations: modes150,
  temperature: '298.15 K',
}

const cases: Case[] = [
  {
    name: 'levels, 10^6 levels (levelTable: numbers + one unit)',
    target: 20,
    runs: 21,
    // 10^6-level cases allocate 16 MB of fresh result columns per run: the first runs also pay the
    // compiler and the operating system's first touch of new memory pages, so they warm up longer.
    warmUp: 10,
    request: () => ({ kind: 'levels', input: { levelTable: { energyUnit: 'cm^-1', energies: millionEnergies, degeneracies: millionDegeneracies }, temperature: '298.15 K' } }),
  },
  {
    name: 'levels, 10^6 levels (levelTable) with amount 1 mol',
    target: null,
    runs: 10,
    request: () => ({ kind: 'levels', input: { levelTable: { energyUnit: 'cm^-1', energies: millionEnergies, degeneracies: millionDegeneracies }, temperature: '298.15 K', amount: '1 mol' } }),
  },
  {
    // What an HTTP answer or a signed record adds: writing the 10^6-level result as JSON text.
    name: 'levels, 10^6 levels (levelTable), evaluated and written as JSON',
    target: null,
    runs: 5,
    request: () => ({ kind: 'none', input: null }),
    direct: () => JSON.stringify(evaluate({ kind: 'levels', input: { levelTable: { energyUnit: 'cm^-1', energies: millionEnergies, degeneracies: millionDegeneracies }, temperature: '298.15 K' } })).length,
  },
  {
    name: 'levelPopulations, 10^6 levels in typed arrays (no JSON result)',
    target: 20,
    runs: 21,
    warmUp: 10,
    request: () => ({ kind: 'none', input: null }),
    direct: () => levelPopulations(millionJoules, millionDegeneracyArray, 298.15),
  },
  ...(rowsMillion
    ? [{ name: 'levels, 10^6 levels as text rows', target: null, runs: 3, request: () => ({ kind: 'levels', input: { levels: rowsMillion, temperature: '298.15 K' } }) }]
    : []),
  {
    name: 'rotation sweep, 2000 J values x 500 temperatures',
    target: null,
    runs: 5,
    request: () => ({
      kind: 'sweep',
      input: { kind: 'rotation', baseInput: { rotationalConstant: '0.39022 cm^-1', symmetryNumber: 2, maxJ: 1999 }, start: '10 K', stop: '5000 K', points: 500, spacing: 'logarithmic', outputs: ['partitionFunction', 'mostPopulatedJ'] },
    }),
  },
  { name: 'microstates, N = Q = 30 (5604 distributions)', target: null, runs: 15, request: () => ({ kind: 'microstates', input: { oscillators: { count: 30, quanta: 30 } } }) },
  {
    name: 'thermochemistry, 150 modes x 1000 temperatures',
    target: null,
    runs: 10,
    request: () => ({
      kind: 'sweep',
      input: { kind: 'thermochemistry', baseInput: thermochemistry150, start: '100 K', stop: '3000 K', points: 1000, spacing: 'linear', outputs: ['totals.entropy', 'totals.heatCapacityP', 'totals.gibbsMinusH0'] },
    }),
  },
  // Typing sizes: what a person enters in a block; each must recompute within a frame.
  { name: 'typing: levels, 5000 text rows', target: 16, runs: 30, request: () => ({ kind: 'levels', input: { levels: rows5000, temperature: '298.15 K', amount: '1 mol' } }) },
  { name: 'typing: levels, 20 text rows', target: 16, runs: 200, request: () => ({ kind: 'levels', input: { levels: levelRows(20), temperature: '25 degC', amount: '1 mol' } }) },
  {
    name: 'typing: vibration, 30 modes (10 anharmonic)',
    target: 16,
    runs: 200,
    request: () => ({ kind: 'vibration', input: { modes: Array.from({ length: 30 }, (_, index) => ({ wavenumber: `${300 + index * 100} cm^-1`, ...(index < 10 ? { anharmonicity: '5 cm^-1' } : {}) })), temperature: '500 K' } }),
  },
  { name: 'typing: rotation, CO2-like at 1000 K', target: 16, runs: 200, request: () => ({ kind: 'rotation', input: { rotationalConstant: '0.39022 cm^-1', symmetryNumber: 2, nuclearSpinWeights: { even: 1, odd: 0 }, temperature: '1000 K' } }) },
  { name: 'typing: spin, 1H at 9.4 T', target: 16, runs: 500, request: () => ({ kind: 'spin', input: { nucleus: '1H', field: '9.4 T', temperature: '298.15 K' } }) },
  { name: 'typing: microstates, N = Q = 30', target: 16, runs: 30, request: () => ({ kind: 'microstates', input: { oscillators: { count: 30, quanta: 30 } } }) },
  { name: 'typing: microstates, N = 10^4, Q = 10^4 (beyond limit)', target: 16, runs: 30, request: () => ({ kind: 'microstates', input: { oscillators: { count: 10_000, quanta: 10_000 } } }) },
  {
    name: 'typing: boltzmannPlot, 50 lines',
    target: 16,
    runs: 200,
    request: () => ({ kind: 'boltzmannPlot', input: { lines: Array.from({ length: 50 }, (_, index) => ({ upperEnergy: `${1000 + index * 300} cm^-1`, degeneracy: 1 + (index % 4), intensity: (1 + (index % 4)) * Math.exp(-(1000 + index * 300) * 1.4388 / 5000) * (1 + 0.01 * Math.sin(index)), uncertainty: 0.01 })) } }),
  },
  { name: 'typing: thermochemistry, 150 modes', target: 16, runs: 200, request: () => ({ kind: 'thermochemistry', input: thermochemistry150 }) },
  {
    name: 'typing: sweep, 50 levels x 200 temperatures',
    target: 16,
    runs: 30,
    request: () => ({ kind: 'sweep', input: { kind: 'levels', baseInput: { levels: levelRows(50) }, start: '50 K', stop: '2000 K', points: 200, spacing: 'logarithmic', outputs: ['levels[1].fraction', 'molarHeatCapacity'] } }),
  },
  {
    name: 'typing: solveTemperature, 50 levels',
    target: 16,
    runs: 50,
    request: () => ({ kind: 'solveTemperature', input: { kind: 'levels', baseInput: { levels: levelRows(50) }, output: 'levels[0].fraction', target: 0.05, lower: '10 K', upper: '5000 K' } }),
  },
]

function percentile(sorted: number[], fraction: number): number {
  const position = Math.min(sorted.length - 1, Math.ceil(fraction * sorted.length) - 1)
  return sorted[Math.max(0, position)]!
}

const only = process.argv.find((argument) => argument.startsWith('--only='))?.slice('--only='.length)
const rows: string[][] = []
let failures = 0
for (const benchCase of cases.filter((candidate) => !only || candidate.name.includes(only))) {
  const warmUp = benchCase.warmUp ?? Math.max(2, Math.min(10, Math.ceil(benchCase.runs / 5)))
  const once = benchCase.direct ?? (() => evaluate(benchCase.request()))
  for (let run = 0; run < warmUp; run++) once()
  const times: number[] = []
  for (let run = 0; run < benchCase.runs; run++) {
    const request = benchCase.direct ? null : benchCase.request()
    const start = performance.now()
    if (request) evaluate(request)
    else benchCase.direct!()
    times.push(performance.now() - start)
  }
  times.sort((a, b) => a - b)
  const median = percentile(times, 0.5)
  const p95 = percentile(times, 0.95)
  const verdict = benchCase.target === null ? 'no target' : median <= benchCase.target ? `meets ≤ ${benchCase.target} ms` : `MISSES ≤ ${benchCase.target} ms`
  if (benchCase.target !== null && median > benchCase.target) failures++
  rows.push([benchCase.name, times[0]!.toFixed(2), median.toFixed(2), p95.toFixed(2), String(benchCase.runs), verdict])
}

// min: the run that paid nothing but the work (no garbage collection or fresh memory pages).
const header = ['case', 'min ms', 'median ms', 'p95 ms', 'runs', 'target (median)']
const widths = header.map((title, column) => Math.max(title.length, ...rows.map((row) => row[column]!.length)))
const line = (cells: string[]) => cells.map((cell, column) => (column === 0 ? cell.padEnd(widths[column]!) : cell.padStart(widths[column]!))).join('  ')
console.log(line(header))
console.log(widths.map((width) => '-'.repeat(width)).join('  '))
for (const row of rows) console.log(line(row))
console.log(`\nNode ${process.version}; ${failures === 0 ? 'all targets met' : `${failures} target(s) missed`} (machine shared with other work: figures vary from run to run).`)
