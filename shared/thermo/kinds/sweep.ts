/**
 * Kinds `sweep` and `solveTemperature`: run another kind over a temperature grid, or find the
 * temperature at which one of its outputs reaches a target by bracketed root finding (Brent).
 */
import { z } from 'zod'
import { EngineInputError, inputError } from '../errors'
import { brentRoot } from '../numerics'
import { describeInput, issuesFromZod, strictObject, wholeNumber } from '../schema'
import { temperatureField } from './common'
import { messageNumber } from '../units'

/** What sweep needs to know about another kind. */
export interface SweepableKind {
  schema: z.ZodType
  compute: (input: any, warnings?: string[]) => unknown
  temperatureField: string | null
  version: number
}

const kindName = z.string({ error: (issue) => `expected the name of a calculation kind, got ${describeInput(issue.input)}` })
const baseInput = z.record(z.string(), z.unknown(), { error: (issue) => `expected the input of that kind as an object, got ${describeInput(issue.input)}` })
const outputPath = z.string({ error: (issue) => `expected an output path such as 'partitionFunction' or 'levels[1].fraction', got ${describeInput(issue.input)}` }).min(1, { error: 'expected an output path such as partitionFunction' })

export const sweepSchema = strictObject({
  kind: kindName,
  baseInput,
  parameter: z.literal('temperature', { error: "only 'temperature' can be swept" }).default('temperature'),
  start: temperatureField,
  stop: temperatureField,
  points: wholeNumber('a number of points: a whole number from 1 to 2000').refine((value) => value <= 2000, { error: 'expected at most 2000 points' }),
  spacing: z.enum(['linear', 'logarithmic'], { error: "expected 'linear' or 'logarithmic'" }).default('linear'),
  outputs: z.array(outputPath, { error: 'expected a list of output paths' }).min(1, { error: 'choose at least one output' }).max(50, { error: 'expected at most 50 outputs' }),
})

export const solveTemperatureSchema = strictObject({
  kind: kindName,
  baseInput,
  output: outputPath,
  target: z.number({ error: (issue) => `expected the target value as a number, got ${describeInput(issue.input)}` }).refine(Number.isFinite, { error: 'expected a finite target value' }),
  lower: temperatureField,
  upper: temperatureField,
})

type Path = (string | number)[]

/** Splits 'levels[1].fraction' into ['levels', 1, 'fraction']. */
export function parseOutputPath(text: string): Path | null {
  const path: Path = []
  const pattern = /([A-Za-z_$][\w$]*)|\[(\d+)\]|(\.)/gy
  let expectName = true
  let match: RegExpExecArray | null
  let position = 0
  pattern.lastIndex = 0
  while (position < text.length && (match = pattern.exec(text))) {
    position = pattern.lastIndex
    if (match[1] !== undefined) {
      if (!expectName) return null
      path.push(match[1])
      expectName = false
    } else if (match[2] !== undefined) {
      if (path.length === 0) return null
      path.push(Number(match[2]))
      expectName = false
    } else {
      if (expectName) return null
      expectName = true
    }
  }
  if (position !== text.length || expectName || path.length === 0) return null
  return path
}

/** Reads a numeric output; undefined if the path does not lead to a number or null. */
export function readOutput(result: unknown, path: Path): number | null | undefined {
  let value: unknown = result
  for (const key of path) {
    if (value === null || typeof value !== 'object') return undefined
    value = (value as Record<string | number, unknown>)[key]
  }
  if (value === null) return null
  return typeof value === 'number' ? value : undefined
}

function numericFields(result: unknown): string[] {
  if (!result || typeof result !== 'object') return []
  return Object.entries(result as Record<string, unknown>).filter(([, value]) => typeof value === 'number').map(([key]) => key)
}

interface Prepared {
  kind: SweepableKind
  parsed: Record<string, unknown>
  field: string
}

function prepare(kinds: Record<string, SweepableKind>, kindText: string, base: Record<string, unknown>, fallbackTemperature: string): Prepared {
  const kind = kinds[kindText]
  if (!kind) inputError('kind', `unknown kind '${kindText}'; kinds that depend on temperature: ${Object.keys(kinds).filter((name) => kinds[name]!.temperatureField).join(', ')}`)
  const field = kind.temperatureField
  if (!field) inputError('kind', `'${kindText}' does not depend on temperature, so it cannot be swept or solved for a temperature`)
  const withTemperature = base[field] === undefined ? { ...base, [field]: fallbackTemperature } : base
  const parsed = kind.schema.safeParse(withTemperature)
  if (!parsed.success) throw new EngineInputError(issuesFromZod(parsed.error, 'baseInput'))
  return { kind, parsed: parsed.data as Record<string, unknown>, field }
}

function resolveOutputs(outputs: string[], firstResult: unknown, kindText: string, pathPrefix: (index: number) => string): Path[] {
  return outputs.map((text, index) => {
    const path = parseOutputPath(text)
    if (!path) inputError(pathPrefix(index), `'${text}' is not an output path; write for example 'partitionFunction' or 'levels[1].fraction'`)
    if (readOutput(firstResult, path) === undefined) {
      inputError(pathPrefix(index), `'${text}' is not a number in the ${kindText} result; numbers at the top level include: ${numericFields(firstResult).join(', ') || 'none'}`)
    }
    return path
  })
}

/** Builds the temperature grid: linear or geometric between start and stop. */
export function temperatureGrid(start: number, stop: number, points: number, spacing: 'linear' | 'logarithmic'): number[] {
  if (points === 1) return [start]
  const grid: number[] = new Array(points)
  for (let index = 0; index < points; index++) {
    const t = index / (points - 1)
    grid[index] = spacing === 'linear' ? start + (stop - start) * t : start * Math.pow(stop / start, t)
  }
  grid[points - 1] = stop
  return grid
}

/**
 * Adds the warnings of one temperature, each kind of message once: messages that differ only in
 * their numbers (the largest level summed, a fraction) are shown at the first temperature only.
 */
function addWarnings(target: string[], seen: Set<string>, source: string[], temperature: number) {
  for (const warning of source) {
    const key = warning.replace(/[-+]?\d[\d.,×⁰¹²³⁴⁵⁶⁷⁸⁹⁻e+-]*/g, '#')
    if (seen.has(key)) continue
    seen.add(key)
    if (seen.size <= 20) target.push(`At ${temperature.toPrecision(6)} K: ${warning}`)
  }
}

/** Creates the sweep and solveTemperature kinds over the given kinds. */
export function createSweepKinds(kinds: Record<string, SweepableKind>) {
  function computeSweep(input: z.output<typeof sweepSchema>, warnings: string[] = []) {
    const { kind, parsed, field } = prepare(kinds, input.kind, input.baseInput, `${input.start} K`)
    const temperatures = temperatureGrid(input.start, input.stop, input.points, input.spacing)
    const seen = new Set<string>()
    const values: (number | null)[][] = input.outputs.map(() => new Array(temperatures.length))
    let paths: Path[] = []
    for (let index = 0; index < temperatures.length; index++) {
      const local: string[] = []
      const result = kind.compute({ ...parsed, [field]: temperatures[index] }, local)
      if (index === 0) paths = resolveOutputs(input.outputs, result, input.kind, (position) => `outputs[${position}]`)
      addWarnings(warnings, seen, local, temperatures[index]!)
      for (let output = 0; output < paths.length; output++) {
        const value = readOutput(result, paths[output]!)
        values[output]![index] = typeof value === 'number' && Number.isFinite(value) ? value : null
      }
    }
    return {
      kind: input.kind,
      parameter: 'temperature' as const,
      temperatures,
      series: input.outputs.map((output, index) => ({ output, values: values[index]! })),
      units: { temperatures: 'K' },
    }
  }

  function computeSolve(input: z.output<typeof solveTemperatureSchema>, warnings: string[] = []) {
    if (!(input.upper > input.lower)) inputError('upper', `the upper temperature must be above the lower one (${input.lower} K)`)
    const { kind, parsed, field } = prepare(kinds, input.kind, input.baseInput, `${input.lower} K`)
    let path: Path = []
    const seen = new Set<string>()
    let evaluations = 0
    const valueAt = (temperature: number): number => {
      const local: string[] = []
      const result = kind.compute({ ...parsed, [field]: temperature }, local)
      evaluations++
      if (evaluations === 1) path = resolveOutputs([input.output], result, input.kind, () => 'output')[0]!
      addWarnings(warnings, seen, local, temperature)
      const value = readOutput(result, path)
      return typeof value === 'number' && Number.isFinite(value) ? value - input.target : Number.NaN
    }
    // Bracket: the two ends first, then a coarse geometric scan for a sign change.
    const grid = temperatureGrid(input.lower, input.upper, 33, 'logarithmic')
    let previousT = grid[0]!
    let previousF = valueAt(previousT)
    let bracket: [number, number, number, number] | null = previousF === 0 ? [previousT, previousT, 0, 0] : null
    let lowest = previousF
    let highest = previousF
    for (let index = 1; index < grid.length && !bracket; index++) {
      const T = grid[index]!
      const f = valueAt(T)
      if (Number.isFinite(f)) {
        lowest = Number.isFinite(lowest) ? Math.min(lowest, f) : f
        highest = Number.isFinite(highest) ? Math.max(highest, f) : f
      }
      if (Number.isFinite(f) && Number.isFinite(previousF) && (f === 0 || Math.sign(f) !== Math.sign(previousF))) bracket = [previousT, T, previousF, f]
      previousT = T
      previousF = f
    }
    if (!bracket) {
      const range = Number.isFinite(lowest) ? `runs between ${messageNumber(lowest + input.target, 6)} and ${messageNumber(highest + input.target, 6)}` : 'is not a number'
      inputError('target', `no temperature between ${input.lower} K and ${input.upper} K gives ${input.output} = ${input.target}: there the output ${range}. Change the target or widen lower/upper.`)
    }
    const [a, b, fa, fb] = bracket
    const solved = a === b ? { root: a, iterations: 0 } : brentRoot(valueAt, a, b, fa, fb, 1e-12)
    return {
      kind: input.kind,
      output: input.output,
      target: input.target,
      temperature: solved.root,
      value: valueAt(solved.root) + input.target,
      // How many steps the root finder took is left out: it depends on the last binary digits
      // (a stop test on the edge), so two machines may differ by one step while agreeing on
      // the root within the record tolerance (shared/records/recheck.ts).
      units: { temperature: 'K' },
    }
  }

  return {
    sweep: {
      title: 'Temperature sweep',
      description: 'Runs another calculation over a grid of temperatures and returns the chosen outputs as series for a chart or table.',
      version: 2,
      schema: sweepSchema,
      compute: computeSweep,
      temperatureField: null,
      exampleInput: {
        kind: 'levels',
        baseInput: { levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 3 }] },
        parameter: 'temperature',
        start: '50 K',
        stop: '1000 K',
        points: 50,
        spacing: 'logarithmic',
        outputs: ['levels[1].fraction'],
      },
    },
    solveTemperature: {
      title: 'Temperature for a target',
      description: 'Finds the temperature at which a chosen output of another calculation reaches a target value, by bracketed root finding.',
      version: 3,
      schema: solveTemperatureSchema,
      compute: computeSolve,
      temperatureField: null,
      exampleInput: {
        kind: 'levels',
        baseInput: { levels: [{ energy: '0 cm^-1' }, { energy: '200 cm^-1', degeneracy: 3 }] },
        output: 'levels[1].fraction',
        target: 0.5,
        lower: '10 K',
        upper: '2000 K',
      },
    },
  }
}

