import canonicalize from 'canonicalize'

/** Thrown for a value that RFC 8785 canonical JSON cannot represent exactly. */
export class CanonicalJsonError extends Error {
  override name = 'CanonicalJsonError'
}

// A lone surrogate has no UTF-8 form; RFC 8785 §3.1 requires I-JSON (RFC 7493 §2.1), which forbids it.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/

function describePath(path: string, key: string | number): string {
  if (typeof key === 'number') return `${path}[${key}]`
  return /^[A-Za-z_$][\w$]*$/.test(key) ? `${path}.${key}` : `${path}[${JSON.stringify(key)}]`
}

/**
 * Refuses anything JSON.stringify would change silently (drop, turn into null, or turn into
 * "{}"), so a signature always covers exactly the value the caller holds.
 */
function assertJsonValue(value: unknown, path: string, seen: Set<object>): void {
  switch (typeof value) {
    case 'string':
      if (LONE_SURROGATE.test(value)) {
        throw new CanonicalJsonError(`${path} contains a lone UTF-16 surrogate, which JSON text cannot carry (RFC 8785 §3.1)`)
      }
      return
    case 'boolean':
      return
    case 'number':
      if (!Number.isFinite(value)) {
        throw new CanonicalJsonError(`${path} is ${value}; JSON numbers must be finite (RFC 8785 §3.2.2.3)`)
      }
      return
    case 'bigint':
      throw new CanonicalJsonError(`${path} is a BigInt; JSON numbers are IEEE 754 doubles (RFC 8785 §3.2.2.3) — convert it to a string or number first`)
    case 'undefined':
      throw new CanonicalJsonError(`${path} is undefined, which JSON cannot carry`)
    case 'function':
    case 'symbol':
      throw new CanonicalJsonError(`${path} is a ${typeof value}, which JSON cannot carry`)
  }
  if (value === null) return
  const object = value as object
  if (seen.has(object)) throw new CanonicalJsonError(`${path} refers back to itself (a cycle)`)
  seen.add(object)
  if (Array.isArray(object)) {
    object.forEach((item, index) => assertJsonValue(item, describePath(path, index), seen))
  } else {
    const prototype = Object.getPrototypeOf(object)
    if (prototype !== Object.prototype && prototype !== null) {
      const kind = (prototype?.constructor as { name?: string } | undefined)?.name ?? 'non-plain object'
      throw new CanonicalJsonError(`${path} is a ${kind}; only plain objects, arrays, strings, finite numbers, booleans and null can be signed`)
    }
    for (const [key, item] of Object.entries(object)) {
      if (LONE_SURROGATE.test(key)) {
        throw new CanonicalJsonError(`${path} has a property name with a lone UTF-16 surrogate (RFC 8785 §3.1)`)
      }
      // An undefined property is absent in JSON, as with JSON.stringify: `{ countersigns: undefined }`
      // and `{}` are the same statement.
      if (item !== undefined) assertJsonValue(item, describePath(path, key), seen)
    }
  }
  seen.delete(object)
}

/**
 * RFC 8785 JSON Canonicalization Scheme: properties sorted by UTF-16 code units, numbers in
 * ECMAScript shortest form, minimal string escapes, no whitespace. Implemented by the
 * `canonicalize` package; this wrapper only rejects values JSON cannot carry, naming where.
 */
export function canonicalJson(value: unknown): string {
  assertJsonValue(value, '$', new Set())
  const text = canonicalize(value)
  if (text === undefined) throw new CanonicalJsonError('$ has no JSON representation')
  return text
}
