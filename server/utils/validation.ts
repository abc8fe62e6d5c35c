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
  requireJsonBody(event)
  return parseWith(schema, await readBody(event), 'body')
}

/**
 * Routes that read a JSON body take JSON only: a body of another type (a form, plain text)
 * is refused with 415 before anything parses it (h3's readBody would otherwise decode a form
 * into an object, NUL characters and all). A request without a body passes: the schema then
 * says what is missing.
 */
export function requireJsonBody(event: H3Event) {
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  const chunked = /\bchunked\b/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')
  if (!(length > 0) && !chunked)
    return
  const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  if (!/^application\/([a-z0-9.+-]+\+)?json$/.test(type)) {
    throw createError({
      statusCode: 415,
      statusMessage: 'Unsupported Media Type',
      message: `body: this route takes JSON (Content-Type: application/json), not ${type || 'a body without a Content-Type'}.`,
      data: { issues: [{ path: 'body', message: 'expected application/json' }] },
    })
  }
}

export function validQuery<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseWith(schema, getQuery(event), 'query')
}

export function validParams<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseWith(schema, getRouterParams(event, { decode: true }), 'route')
}
