/**
 * Property-based fuzzing of every JSON route in the table: fast-check generates the bodies
 * (from a fixed seed, so a failure can be replayed), they are sent a few at a time, and the
 * property is "never a 5xx, and the server still answers /api/health afterwards".
 */
import fc from 'fast-check'
import type { Client } from './client'

export const FUZZ_RUNS = Number(process.env.HARDENING_FUZZ_RUNS ?? 1000)
export const FUZZ_SEED = Number(process.env.HARDENING_FUZZ_SEED ?? 20260417)

const nasty = [
  '\u0000', 'a\u0000b', '\ud800', 'x\udfffy', '\ufeff', '\u202eevil', '\u200b', 'Ω≈ç√∫', '𝔘𝔫𝔦𝔠𝔬𝔡𝔢', '👩‍🔬',
  '<script>alert(1)</script>', '<img src=x onerror=alert(1)>', '"><svg onload=alert(1)>', 'javascript:alert(1)',
  "'; DROP TABLE entries; --", '%00', '../../../../etc/passwd', '${7*7}', '{{7*7}}', 'NaN', 'Infinity', '-0',
  '1e309', '0x10', ' ', '', '\n\r\t', 'null', 'true', '__proto__', 'constructor',
]

const pollutionKeys = ['__proto__', 'constructor', 'prototype', 'toString', 'valueOf', 'hasOwnProperty', '__defineGetter__']

const hostileString = fc.oneof(
  fc.string(),
  fc.string({ unit: 'binary', maxLength: 50 }),
  fc.constantFrom(...nasty),
  fc.array(fc.constantFrom(...nasty), { maxLength: 5 }).map(parts => parts.join('')),
  fc.integer({ min: 1_000, max: 400_000 }).map(n => 'A'.repeat(n)),
  fc.integer({ min: 1, max: 2000 }).map(n => '\ud83d\ude00'.repeat(n)),
)

const hostileNumber = fc.oneof(fc.integer(), fc.double(), fc.constantFrom(0, -1, 1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, 2 ** 31, -(2 ** 31) - 1))

const { value: hostileValue } = fc.letrec<{ value: unknown }>(tie => ({
  value: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    hostileString,
    hostileNumber,
    fc.boolean(),
    fc.constant(null),
    fc.array(tie('value'), { maxLength: 6 }),
    fc.dictionary(fc.oneof(fc.string(), fc.constantFrom(...pollutionKeys)), tie('value'), { maxKeys: 6 }),
  ),
}))

/** JSON text (not objects): lets us send keys such as __proto__ verbatim, and broken JSON. */
function jsonText(value: unknown): string {
  return JSON.stringify(value) ?? 'null'
}

function deep(depth: number, open: string, close: string, inner = '1') {
  return open.repeat(depth) + inner + close.repeat(depth)
}

function setPath(base: Record<string, unknown>, key: string, value: unknown): string {
  // Build the text by hand so that a key like "__proto__" arrives as an own JSON member.
  const entries = Object.entries(base).filter(([k]) => k !== key)
  const members = [...entries.map(([k, v]) => `${JSON.stringify(k)}:${jsonText(v)}`), `${JSON.stringify(key)}:${jsonText(value)}`]
  return `{${members.join(',')}}`
}

/** Like setPath, with the value given as JSON text (too deep for JSON.stringify to build). */
function setRaw(base: Record<string, unknown>, key: string, rawValue: string): string {
  const entries = Object.entries(base).filter(([k]) => k !== key)
  return `{${[...entries.map(([k, v]) => `${JSON.stringify(k)}:${jsonText(v)}`), `${JSON.stringify(key)}:${rawValue}`].join(',')}}`
}

/** Arbitrary bodies for one route, built around its valid example. */
export function bodyArbitrary(valid: unknown): fc.Arbitrary<string> {
  const example = (valid && typeof valid === 'object' && !Array.isArray(valid) ? valid : {}) as Record<string, unknown>
  const keys = Object.keys(example)
  const someKey = keys.length ? fc.oneof(fc.constantFrom(...keys), fc.string({ maxLength: 12 }), fc.constantFrom(...pollutionKeys)) : fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom(...pollutionKeys))
  return fc.oneof(
    // arbitrary JSON of any shape
    fc.jsonValue().map(jsonText),
    // the valid body with one field replaced by something hostile (wrong type, huge, unicode)
    fc.tuple(someKey, hostileValue).map(([key, value]) => setPath(example, key, value)),
    // every field replaced by a value of a random type
    fc.array(hostileValue, { minLength: keys.length, maxLength: keys.length }).map(values => `{${keys.map((k, i) => `${JSON.stringify(k)}:${jsonText(values[i])}`).join(',')}}`),
    // prototype pollution, as verbatim JSON members next to valid fields
    fc.tuple(fc.constantFrom(...pollutionKeys), hostileValue).map(([key, value]) => `{${JSON.stringify(key)}:{"polluted":true,"isAdmin":true,"roles":["admin"]},${setPath(example, key, value).slice(1)}`),
    fc.constant(`{"__proto__":{"polluted":"yes"},"constructor":{"prototype":{"polluted":"yes"}},${jsonText(example).slice(1)}`),
    // deep nesting, in the body and inside a valid field
    fc.integer({ min: 50, max: 50_000 }).map(n => deep(n, '[', ']')),
    fc.integer({ min: 50, max: 20_000 }).map(n => deep(n, '{"a":', '}')),
    fc.tuple(someKey, fc.integer({ min: 50, max: 5_000 })).map(([key, n]) => setRaw(example, key, deep(n, '{"type":"doc","content":[', ']}', '{}'))),
    // broken JSON, truncated JSON, not JSON at all
    fc.string().map(s => `{${s}`),
    fc.integer({ min: 0, max: 200 }).map(n => jsonText(example).slice(0, n)),
    fc.constantFrom('', 'null', '[]', '""', '0', 'true', '{}', '{"a":1,}', "{'a':1}", 'NaN', '\u0000', '{"a":"\\ud800"}', '{"a":"\\u0000"}'),
  )
}

export interface FuzzOutcome {
  route: string
  sent: number
  statusCodes: Record<string, number>
  failures: Array<{ status: number, body: string, answer: string }>
  healthyAfter: boolean
  ok: boolean
}

async function inBatches<T>(items: T[], size: number, work: (item: T) => Promise<void>) {
  let next = 0
  await Promise.all(Array.from({ length: size }, async () => {
    while (next < items.length) await work(items[next++]!)
  }))
}

export async function fuzzRoute(route: string, method: string, path: string, client: Client, valid: unknown, health: () => Promise<boolean>, seedOffset: number): Promise<FuzzOutcome> {
  const bodies = fc.sample(bodyArbitrary(valid), { numRuns: FUZZ_RUNS, seed: FUZZ_SEED + seedOffset })
  const statusCodes: Record<string, number> = {}
  const failures: FuzzOutcome['failures'] = []
  await inBatches(bodies, 6, async (body) => {
    let status = 0
    let answer = ''
    try {
      const reply = await client.request(method, path, body)
      status = reply.status
      answer = reply.text
    }
    catch (error) {
      answer = `request failed: ${(error as Error).message}`
    }
    statusCodes[status] = (statusCodes[status] ?? 0) + 1
    if (status === 0 || status >= 500)
      failures.push({ status, body: body.length > 300 ? `${body.slice(0, 300)}… (${body.length} chars)` : body, answer: answer.slice(0, 300) })
  })
  const healthyAfter = await health()
  return { route, sent: bodies.length, statusCodes, failures, healthyAfter, ok: failures.length === 0 && healthyAfter }
}
