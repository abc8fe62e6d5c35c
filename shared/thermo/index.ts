/**
 * Thermotome calculation engine: pure TypeScript, no I/O, the same in the browser and on the server.
 * evaluate({kind, input}) → {kind, engineVersion, result, warnings}.
 */
import { EngineInputError, type InputIssue } from './errors'
import { registry, type KindDefinition, type KindName, type KindResults } from './registry'
import { issuesFromZod } from './schema'
import { NumberColumn, isKnownFinite, isResultColumn } from './columns'
import { isWavelengthText } from './units'

export * from './constants'
export { EngineInputError, type InputIssue } from './errors'
export {
  parseQuantity,
  toKelvin,
  toJoules,
  toPascal,
  toTesla,
  toHertz,
  toKilogramsPerMole,
  toParticleCount,
  toGyromagneticRatio,
  energyFactor,
  joulesToWavenumber,
  joulesToMolar,
  type Quantity,
  type Dimension,
} from './units'
export { registry, isKindName, type KindDefinition, type KindName, type KindResults, type SweepResult, type SolveTemperatureResult } from './registry'
export { NUCLEI } from './kinds/spin'
export { levelPopulations } from './kinds/levels'
export { NumberColumn, FlagColumn, isResultColumn } from './columns'
export { boltzmannStatistics, molarFunctions, logGamma, logFactorial, binomialBig } from './numerics'
export { ENUMERATION_LIMIT } from './kinds/microstates'
export type { LevelsResult, LevelPopulation, LevelTableResult } from './kinds/levels'
export type { VibrationResult } from './kinds/vibration'
export type { RotationResult } from './kinds/rotation'
export type { SpinResult } from './kinds/spin'
export type { MicrostatesResult } from './kinds/microstates'
export type { BoltzmannPlotResult } from './kinds/boltzmannPlot'
export type { ThermochemistryResult } from './kinds/thermochemistry'

/** Version of the engine as a whole; each kind also carries its own version. */
export const ENGINE_VERSION = '1.0.0'

export interface EvaluationRequest {
  kind: string
  input: unknown
}

/** The result type of a kind named by a literal; unknown for a kind known only as a string. */
export type ResultOf<Kind extends string> = Kind extends KindName ? KindResults[Kind] : unknown

export interface EvaluationResult {
  kind: string
  /** ENGINE_VERSION and the kind's version, e.g. '1.0.0/levels@1'. */
  engineVersion: string
  /**
   * Still untyped: the engine tests read results without narrowing. The type of each kind's
   * result is ResultOf<kind> (registry.ts); readers outside the tests (shared/present) use it.
   */
  result: any
  warnings: string[]
}

/** The kinds for a block picker. */
export function listKinds(): { kind: string; title: string; description: string; version: number; exampleInput: unknown }[] {
  return Object.entries(registry).map(([kind, definition]) => ({
    kind,
    title: definition.title,
    description: definition.description,
    version: definition.version,
    exampleInput: structuredClone(definition.exampleInput),
  }))
}

/**
 * Validates the input of a kind and computes its result. Throws EngineInputError (with field
 * paths) for any invalid input and nothing else for bad input.
 */
export function evaluate(request: EvaluationRequest): EvaluationResult {
  if (request === null || typeof request !== 'object') {
    throw new EngineInputError([{ path: '', message: 'expected a request {kind, input}' }])
  }
  const kind = (request as { kind?: unknown }).kind
  if (typeof kind !== 'string' || !Object.hasOwn(registry, kind)) {
    throw new EngineInputError([{ path: 'kind', message: `expected one of the kinds ${Object.keys(registry).join(', ')}, got ${typeof kind === 'string' ? `'${kind}'` : 'no kind'}` }])
  }
  const definition: KindDefinition = registry[kind]!
  const input = (request as { input?: unknown }).input
  if (input === null || typeof input !== 'object' || Array.isArray(input)) {
    throw new EngineInputError([{ path: 'input', message: `expected the input of '${kind}' as an object with named fields` }])
  }
  const parsed = definition.schema.safeParse(input)
  if (!parsed.success) throw new EngineInputError(issuesFromZod(parsed.error))
  const warnings: string[] = []
  let result: unknown
  try {
    result = definition.compute(parsed.data, warnings)
  } catch (error) {
    if (error instanceof EngineInputError) throw error
    if (error instanceof RangeError) {
      throw new EngineInputError([{ path: '', message: `the input is too large to compute (${error.message})` }])
    }
    throw error
  }
  const wavelengths = wavelengthTexts(input)
  if (wavelengths.length > 0) {
    warnings.push(`${wavelengths.map((text) => `'${text.trim()}'`).join(', ')}${wavelengths.length === WAVELENGTHS_NAMED ? ' and perhaps others' : ''} ${wavelengths.length === 1 ? 'is' : 'are'} read as vacuum wavelength${wavelengths.length === 1 ? '' : 's'}: E = hc/λ. A wavelength measured in air is shorter by the refractive index of air (about 1.0003).`)
  }
  if (replaceNonFinite(result)) {
    warnings.push('Some numbers were outside the range of a double and are reported as null.')
  }
  return { kind, engineVersion: `${ENGINE_VERSION}/${kind}@${definition.version}`, result, warnings }
}

const WAVELENGTHS_NAMED = 3
const TEXTS_SCANNED = 20_000

/** Up to three texts of the input given as wavelengths (energies in nm, µm or Å). */
function wavelengthTexts(input: unknown): string[] {
  const found: string[] = []
  let scanned = 0
  const visit = (value: unknown): void => {
    if (found.length >= WAVELENGTHS_NAMED || scanned > TEXTS_SCANNED) return
    if (typeof value === 'string') {
      scanned++
      if (isWavelengthText(value)) found.push(value)
    } else if (Array.isArray(value)) {
      for (const item of value) visit(item)
    } else if (value !== null && typeof value === 'object') {
      for (const item of Object.values(value)) visit(item)
    }
  }
  visit(input)
  return found
}

/**
 * Replaces NaN and ±Infinity by null in place so results stay JSON; returns whether any were
 * found. A result column keeps its numbers and writes non-finite ones as null in its JSON.
 */
function replaceNonFinite(value: unknown): boolean {
  if (value === null || typeof value !== 'object' || isKnownFinite(value)) return false
  if (isResultColumn(value)) return value instanceof NumberColumn && !value.allFinite()
  let found = false
  if (Array.isArray(value)) {
    for (let index = 0; index < value.length; index++) {
      const item = value[index]
      if (typeof item === 'number') {
        if (!Number.isFinite(item)) {
          value[index] = null
          found = true
        }
      } else if (item !== null && typeof item === 'object') {
        if (replaceNonFinite(item)) found = true
      }
    }
    return found
  }
  const record = value as Record<string, unknown>
  for (const key in record) {
    const item = record[key]
    if (typeof item === 'number') {
      if (!Number.isFinite(item)) {
        record[key] = null
        found = true
      }
    } else if (item !== null && typeof item === 'object') {
      if (replaceNonFinite(item)) found = true
    }
  }
  return found
}

export type { InputIssue as EngineInputIssue }
