import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { CanonicalJsonError, canonicalJson } from '#shared/records'

/** Rebuilds every object with its properties in a pseudo-random order (mulberry32 seeded). */
function reorderKeys(value: unknown, seed: number): unknown {
  let state = seed >>> 0
  const random = () => {
    state = (state + 0x6d2b79f5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  const visit = (item: unknown): unknown => {
    if (Array.isArray(item)) return item.map(visit)
    if (item === null || typeof item !== 'object') return item
    const entries = Object.entries(item)
    for (let index = entries.length - 1; index > 0; index--) {
      const other = Math.floor(random() * (index + 1))
      ;[entries[index], entries[other]] = [entries[other]!, entries[index]!]
    }
    // fromEntries defines own properties, so a "__proto__" key stays a key.
    return Object.fromEntries(entries.map(([key, child]) => [key, visit(child)]))
  }
  return visit(value)
}

describe('canonicalJson', () => {
  it('is stable under reordering of object keys (property, fast-check)', () => {
    // RFC 8785 §3.2.3: property order in the input must not matter
    fc.assert(
      fc.property(fc.jsonValue({ stringUnit: 'grapheme' }), fc.integer(), (value, seed) => {
        expect(canonicalJson(reorderKeys(value, seed))).toBe(canonicalJson(value))
      }),
      { numRuns: 300 },
    )
  })

  it('parses back to the same JSON value (property, fast-check)', () => {
    // RFC 8785 §3.2: canonical output is ordinary JSON carrying the same data
    fc.assert(
      fc.property(fc.jsonValue({ stringUnit: 'grapheme' }), (value) => {
        expect(JSON.parse(canonicalJson(value))).toEqual(JSON.parse(JSON.stringify(value)))
      }),
      { numRuns: 300 },
    )
  })

  it('sorts nested keys and writes no whitespace', () => {
    // RFC 8785 §3.2.1 (no whitespace) and §3.2.3 (recursive sorting)
    expect(canonicalJson({ b: [{ z: 1, a: 2 }], a: { y: null, x: true } })).toBe('{"a":{"x":true,"y":null},"b":[{"a":2,"z":1}]}')
  })

  it('writes -0 as 0 (RFC 8785 §3.2.2.3)', () => {
    // RFC 8785 §3.2.2.3: ECMAScript Number.prototype.toString, which gives "0" for -0
    expect(canonicalJson(-0)).toBe('0')
  })

  it('omits undefined properties, as JSON.stringify does', () => {
    // ECMA-262 JSON.stringify semantics: an undefined property is absent
    expect(canonicalJson({ a: 1, countersigns: undefined })).toBe('{"a":1}')
  })

  const refused: [string, unknown, RegExp][] = [
    ['undefined at top level', undefined, /\$ is undefined/],
    ['NaN', { a: [1, Number.NaN] }, /\$\.a\[1\] is NaN/],
    ['Infinity', { value: Number.POSITIVE_INFINITY }, /\$\.value is Infinity/],
    ['BigInt', { count: 10n }, /\$\.count is a BigInt/],
    ['undefined inside an array', [1, undefined], /\$\[1\] is undefined/],
    ['a function', { run: () => 1 }, /\$\.run is a function/],
    ['a Date', { at: new Date(0) }, /\$\.at is a Date/],
    ['a Map', new Map(), /\$ is a Map/],
    ['a Uint8Array', { bytes: new Uint8Array(2) }, /\$\.bytes is a Uint8Array/],
    ['a lone surrogate', { text: 'a\ud800b' }, /\$\.text contains a lone UTF-16 surrogate/],
    ['a lone surrogate in a key', { '\udc00': 1 }, /property name with a lone UTF-16 surrogate/],
    ['an odd key', { 'odd key': Number.NaN }, /\$\["odd key"\] is NaN/],
  ]
  for (const [name, value, message] of refused) {
    it(`refuses ${name}, naming where`, () => {
      // RFC 8785 §3.1 / §3.2.2.3: only I-JSON values with finite numbers can be canonicalised
      expect(() => canonicalJson(value)).toThrow(CanonicalJsonError)
      expect(() => canonicalJson(value)).toThrow(message)
    })
  }

  it('refuses a cycle instead of overflowing the stack', () => {
    const value: Record<string, unknown> = {}
    value.self = value
    expect(() => canonicalJson(value)).toThrow(/cycle/)
  })

  it('accepts the same object twice when it is not a cycle', () => {
    const shared = { x: 1 }
    expect(canonicalJson({ a: shared, b: shared })).toBe('{"a":{"x":1},"b":{"x":1}}')
  })
})
