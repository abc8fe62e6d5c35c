/** The registry: every calculation kind as {schema, compute, version, title, description, exampleInput}. */
import type { ZodType } from 'zod'
import { boltzmannPlotKind } from './kinds/boltzmannPlot'
import { levelsKind } from './kinds/levels'
import { microstatesKind } from './kinds/microstates'
import { rotationKind } from './kinds/rotation'
import { spinKind } from './kinds/spin'
import { createSweepKinds } from './kinds/sweep'
import { thermochemistryKind } from './kinds/thermochemistry'
import { vibrationKind } from './kinds/vibration'

export interface KindDefinition {
  /** Zod schema of the input; its output is what compute takes (quantities already in SI). */
  schema: ZodType
  /** Pure function from the parsed input to the result; pushes warnings into the array given. */
  compute: (input: any, warnings?: string[]) => any
  /** Bumped whenever the result of the same input can change. */
  version: number
  title: string
  description: string
  /** A small valid input a new block starts with. */
  exampleInput: unknown
  /** Name of the temperature field (for sweep and solveTemperature), or null. */
  temperatureField: string | null
}

const baseKinds: Record<string, KindDefinition> = {
  levels: levelsKind,
  vibration: vibrationKind,
  rotation: rotationKind,
  spin: spinKind,
  microstates: microstatesKind,
  boltzmannPlot: boltzmannPlotKind,
  thermochemistry: thermochemistryKind,
}

export const registry: Record<string, KindDefinition> = {
  ...baseKinds,
  ...createSweepKinds(baseKinds),
}
