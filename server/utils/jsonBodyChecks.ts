/**
 * Checks on a JSON request body's text before any route reads it:
 * - nesting depth: JSON.stringify (drizzle's jsonb columns) and PostgreSQL overflow their
 *   stacks on bodies nested thousands deep; no real document comes near JSON_MAX_DEPTH.
 * - text PostgreSQL cannot store: the NUL character (text and jsonb refuse it) and unpaired
 *   UTF-16 surrogates (jsonb refuses them; text columns would silently store U+FFFD).
 * Returns a field-naming problem for a 400, or null when the body may go on.
 */
export const JSON_MAX_DEPTH = 128

/** Deepest nesting of arrays/objects in JSON text, strings skipped; linear, no recursion. */
export function jsonBodyDepth(text: string): number {
  let depth = 0
  let deepest = 0
  let inString = false
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i)
    if (inString) {
      if (c === 92) i++ // backslash: skip the escaped character
      else if (c === 34) inString = false
      continue
    }
    if (c === 34) inString = true
    else if (c === 91 || c === 123) { if (++depth > deepest) deepest = depth }
    else if (c === 93 || c === 125) depth--
  }
  return deepest
}

/** The first string (key or value) PostgreSQL cannot store, with its path; iterative walk. */
function firstUnstorableString(value: unknown): { path: string, reason: string } | null {
  const stack: Array<{ value: unknown, path: string }> = [{ value, path: '' }]
  const problem = (s: string) => s.includes('\u0000')
    ? 'contains the NUL character (\\u0000), which cannot be stored'
    : !s.isWellFormed() ? 'contains an unpaired UTF-16 surrogate (invalid Unicode text)' : null
  while (stack.length) {
    const { value: current, path } = stack.pop()!
    if (typeof current === 'string') {
      const reason = problem(current)
      if (reason) return { path: path || 'body', reason }
    }
    else if (Array.isArray(current)) {
      current.forEach((item, index) => stack.push({ value: item, path: `${path}[${index}]` }))
    }
    else if (current && typeof current === 'object') {
      for (const [key, item] of Object.entries(current)) {
        const keyReason = problem(key)
        if (keyReason) return { path: path || 'body', reason: `a field name ${keyReason}` }
        stack.push({ value: item, path: path ? `${path}.${key}` : key })
      }
    }
  }
  return null
}

export function jsonBodyProblem(text: string): { path: string, message: string } | null {
  const depth = jsonBodyDepth(text)
  if (depth > JSON_MAX_DEPTH)
    return { path: 'body', message: `nested ${depth} levels deep; at most ${JSON_MAX_DEPTH} are accepted` }
  let parsed: unknown
  try { parsed = JSON.parse(text) }
  catch { return null } // not JSON: the route's own reading answers 400
  const bad = firstUnstorableString(parsed)
  return bad ? { path: bad.path, message: bad.reason } : null
}
