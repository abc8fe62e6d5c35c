/** The registry: every calculation kind as {schema, compute, version, title, description, exampleInput}. */
import type { ZodType } from 'zod'
import { boltzmannPlotKind, type BoltzmannPlotResult } from './kinds/boltzmannPlot'
import { levelsKind, type LevelsResult } from './kinds/levels'
import { microstatesKind, type MicrostatesResult } from './kinds/microstates'
import { rotationKind, type RotationResult } from './kinds/rotation'
import { spinKind, type SpinResult } from './kinds/spin'
import { createSweepKinds } from './kinds/sweep'
import { thermochemistryKind, type ThermochemistryResult } from './kinds/thermochemistry'
import { vibrationKind, type VibrationResult } from './kinds/vibration'

export interface KindDefinition {
  /** Zod schema of the input; its output is what compute takes (quantities already in SI). */
  schema: ZodType
  /**
   * Pure function from the parsed input to the result; pushes warnings into the array given.
   * (Method syntax: each kind takes its own schema's output, which only its schema makes.)
   */
  compute(input: unknown, warnings?: string[]): unknown
  /** Bumped whenever the result of the same input can change. */
  version: number
  title: string
  description: string
  /** A small valid input a new block starts with. */
  exampleInput: unknown
  /** Name of the temperature field (for sweep and solveTemperature), or null. */
  temperatureField: string | null
}

const baseKinds = {
  levels: levelsKind,
  vibration: vibrationKind,
  rotation: rotationKind,
  spin: spinKind,
  microstates: microstatesKind,
  boltzmannPlot: boltzmannPlotKind,
  thermochemistry: thermochemistryKind,
} satisfies Record<string, KindDefinition>

const sweepKinds = createSweepKinds(baseKinds)

export type SweepResult = ReturnType<typeof sweepKinds.sweep.compute>
export type SolveTemperatureResult = ReturnType<typeof sweepKinds.solveTemperature.compute>

/** The result type of every kind: what presentations, records and exports read. */
export interface KindResults {
  levels: LevelsResult
  vibration: VibrationResult
  rotation: RotationResult
  spin: SpinResult
  microstates: MicrostatesResult
  boltzmannPlot: BoltzmannPlotResult
  thermochemistry: ThermochemistryResult
  sweep: SweepResult
  solveTemperature: SolveTemperatureResult
}
export type KindName = keyof KindResults

const kinds = { ...baseKinds, ...sweepKinds } satisfies { [Kind in KindName]: KindDefinition & { compute(input: never, warnings?: string[]): KindResults[Kind] } }

export const registry: Record<string, KindDefinition> = kinds

/** Whether a name is one of the registry's kinds. */
export function isKindName(kind: string): kind is KindName {
  return Object.hasOwn(kinds, kind)
}
