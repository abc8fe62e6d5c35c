// The whole project type-checks: pages and components (.vue, through vue-tsc), server routes,
// shared code, tests and scripts, with the tsconfig files Nuxt generates.
import { spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

const root = fileURLToPath(new URL('../../..', import.meta.url))

describe('type check', () => {
  it('nuxt typecheck reports no errors', { timeout: 600_000 }, () => {
    const run = spawnSync('npx', ['nuxt', 'typecheck'], { cwd: root, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' } })
    const errors = `${run.stdout}\n${run.stderr}`.split('\n').filter(line => /error TS\d+/.test(line))
    expect(errors).toEqual([])
    expect(run.status).toBe(0)
  })
})
