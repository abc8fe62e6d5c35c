/**
 * Zod building blocks for kind inputs, with messages a scientist reads, and the translation
 * of zod issues into EngineInputError issues with field paths.
 */
import { z } from 'zod'
import { EngineInputError, formatPath, type InputIssue } from './errors'

/** Describes an input value for a message ("got the bare number 5"). */
export function describeInput(value: unknown): string {
  if (value === undefined) return 'nothing'
  if (value === null) return 'null'
  if (typeof value === 'number') return `the number ${value}`
  if (typeof value === 'string') return value.trim() === '' ? 'an empty text' : `the text '${value.length > 40 ? `${value.slice(0, 40)}…` : value}'`
  if (typeof value === 'boolean') return `${value}`
  if (Array.isArray(value)) return 'a list'
  return 'an object'
}

/**
 * A field holding a quantity with its unit as text, converted to SI by `convert` (which throws
 * EngineInputError for wrong units); its message is attached to the field's path.
 */
export function quantityField<T>(example: string, convert: (text: string) => T) {
  return z
    .string({
      error: (issue) =>
        issue.input === undefined
          ? `required: a quantity with its unit, such as '${example}'`
          : `expected a quantity with its unit as text, such as '${example}', got ${describeInput(issue.input)}`,
    })
    .transform((text, context) => {
      try {
        return convert(text)
      } catch (error) {
        if (error instanceof EngineInputError) {
          for (const issue of error.issues) context.issues.push({ code: 'custom', message: issue.message, input: text })
          return z.NEVER
        }
        throw error
      }
    })
}

/** A positive whole number (degeneracy, symmetry number, count). */
export function wholeNumber(what: string, minimum = 1) {
  return z
    .number({
      error: (issue) =>
        issue.input === undefined ? `required: ${what}` : `expected ${what}, got ${describeInput(issue.input)}`,
    })
    .refine((value) => Number.isInteger(value), { error: (issue) => `expected ${what}, got ${describeInput(issue.input)} (not a whole number)` })
    .refine((value) => value >= minimum, { error: (issue) => `expected ${what}, got ${describeInput(issue.input)}` })
}

/** A finite number with a description for messages. */
export function finiteNumber(what: string) {
  return z.number({
    error: (issue) => (issue.input === undefined ? `required: ${what}` : `expected ${what}, got ${describeInput(issue.input)}`),
  }).refine((value) => Number.isFinite(value), { error: `expected ${what}, got a number that is not finite` })
}

/** A label text (optional everywhere). */
export const labelField = z.string({ error: (issue) => `expected a label as text, got ${describeInput(issue.input)}` }).max(200, { error: 'a label may have at most 200 characters' }).optional()

/** Turns zod issues into EngineInputError issues, optionally under a parent path. */
export function issuesFromZod(error: z.ZodError, prefix = ''): InputIssue[] {
  const issues: InputIssue[] = []
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) issues.push({ path: formatPath([...issue.path, key], prefix), message: `unknown field '${key}'` })
      continue
    }
    if (issue.code === 'invalid_union' && issue.errors.length > 0 && issue.message === 'Invalid input') {
      issues.push({ path: formatPath(issue.path, prefix), message: 'the value does not match any accepted form' })
      continue
    }
    issues.push({ path: formatPath(issue.path, prefix), message: issue.message })
  }
  return issues
}

/** Parses with a schema or throws EngineInputError with field paths. */
export function parseInput<T extends z.ZodType>(schema: T, input: unknown, prefix = ''): z.output<T> {
  const parsed = schema.safeParse(input)
  if (!parsed.success) throw new EngineInputError(issuesFromZod(parsed.error, prefix))
  return parsed.data
}

/** The object schema used for every kind input: unknown fields are refused by name. */
export const strictObject = z.strictObject
