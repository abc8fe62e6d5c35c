import { describe, expect, it } from 'vitest'
import { JSON_MAX_DEPTH, jsonBodyDepth, jsonBodyProblem } from '../../../server/utils/jsonBodyChecks'

describe('JSON body checks', () => {
  it('measures nesting without counting brackets inside strings', () => {
    expect(jsonBodyDepth('{"a":[1,{"b":2}]}')).toBe(3)
    expect(jsonBodyDepth('{"a":"[[[[{{{{\\"]]]"}')).toBe(1)
    expect(jsonBodyDepth('"plain"')).toBe(0)
  })
  it('refuses nesting past the limit, naming the body', () => {
    const deep = '['.repeat(JSON_MAX_DEPTH + 1) + ']'.repeat(JSON_MAX_DEPTH + 1)
    expect(jsonBodyProblem(deep)?.path).toBe('body')
    expect(jsonBodyProblem('['.repeat(JSON_MAX_DEPTH) + ']'.repeat(JSON_MAX_DEPTH))).toBeNull()
    // Far deeper than any stack: still linear and answered.
    expect(jsonBodyProblem('['.repeat(200_000) + ']'.repeat(200_000))?.message).toContain('200000 levels')
  })
  it('names the field holding NUL or an unpaired surrogate', () => {
    expect(jsonBodyProblem('{"title":"a\\u0000b"}')).toEqual({ path: 'title', message: expect.stringContaining('NUL') })
    expect(jsonBodyProblem('{"content":{"content":[{"text":"x\\ud800"}]}}')?.path).toBe('content.content[0].text')
    expect(jsonBodyProblem('{"a\\u0000":1}')?.message).toContain('field name')
  })
  it('lets ordinary text through, including paired surrogates and markup', () => {
    expect(jsonBodyProblem('{"title":"Ω 👩‍🔬 <b>x</b> \\ud83d\\ude00"}')).toBeNull()
    expect(jsonBodyProblem('not json')).toBeNull()
  })
})
