import type { H3Event } from 'h3'
import type { z } from 'zod'

/** `levels[2].degeneracy` from zod's path array. */
export function formatIssuePath(path: readonly PropertyKey[]): string {
  let out = ''
  for (const part of path) {
    if (typeof part === 'number')
      out += `[${part}]`
    else
      out += out ? `.${String(part)}` : String(part)
  }
  return out
}

export interface FieldIssue { path: string, message: string }

/** Throw a 400 that names every field at fault; never lets a zod error reach the client raw. */
export function validationError(issues: FieldIssue[], where: string): never {
  const first = issues[0]
  const message = first
    ? `${first.path || where}: ${first.message}${issues.length > 1 ? ` (and ${issues.length - 1} more)` : ''}`
    : `invalid ${where}`
  throw createError({ statusCode: 400, message, data: { issues } })
}

export function parseWith<S extends z.ZodType>(schema: S, value: unknown, where: string): z.output<S> {
  const parsed = schema.safeParse(value)
  if (parsed.success)
    return parsed.data
  validationError(parsed.error.issues.map(issue => ({ path: formatIssuePath(issue.path), message: issue.message })), where)
}

// h3's readValidatedBody and friends re-wrap a thrown error as "Validation Error" and bury
// the field list one level deeper; reading first and parsing here keeps one error shape.
export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return parseWith(schema, await readBody(event), 'body')
}

export function validQuery<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseWith(schema, getQuery(event), 'query')
}

export function validParams<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseWith(schema, getRouterParams(event, { decode: true }), 'route')
}
