import { execFile } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { as, demoPerson, type Client } from '../support/http'
import { createSignedRecord, type BundleTamper, type StoredRecord } from '../support/signedRecords'

// One table of attacks on signatures, run through every verifier: the command line
// (scripts/verify.ts), the verify page's check of an uploaded bundle (POST /api/verify), and
// the server's verification of the stored record (GET /api/records/:id/verify). All three call
// shared/records/verify.ts, so each must refuse each case with the same words.
// RFC 8032 §5.1.7 (S < L); small-order keys refused as in libsodium's and noble's strict modes.

const run = promisify(execFile)
const CASES: { name: string, tamper: BundleTamper | undefined, witness: boolean, problem: RegExp | null }[] = [
  { name: 'a sound record (the control)', tamper: undefined, witness: true, problem: null },
  { name: 'an author signature with S + L', tamper: 'malleated-signature', witness: false, problem: /not in canonical form \(its S is not below the group order L/ },
  { name: 'an author key of small order', tamper: 'small-order-key', witness: false, problem: /public key is a point of small order/ },
  { name: 'a witness signature dated before the author\'s', tamper: 'witness-before-author', witness: true, problem: /before the signature it countersigns/ },
]

let felix: Client
const folder = mkdtempSync(join(tmpdir(), 'thermotome-verify-cases-'))
const stored = new Map<string, StoredRecord>()

beforeAll(async () => {
  felix = await as('felix')
  for (const [index, item] of CASES.entries()) {
    stored.set(item.name, await createSignedRecord(inject('databaseURL'), {
      authorEmail: demoPerson('amara').email, witnessEmail: item.witness ? demoPerson('priya').email : undefined,
      notebook: 'Infrared', title: `Verification case ${index + 1}: ${item.name}`, tamper: item.tamper,
    }))
  }
}, 120_000)

describe('every verifier refuses the same attacks, in the same words', () => {
  for (const item of CASES) {
    it(`${item.name}: the command line, the verify page's check and the server agree`, async () => {
      const record = stored.get(item.name)!
      const file = join(folder, `${record.entryId}.json`)
      writeFileSync(file, JSON.stringify(record.bundle))
      const cli = await run(process.execPath, ['--import', 'tsx', 'scripts/verify.ts', file]).then(
        out => ({ code: 0, text: out.stdout }),
        (error: { code: number, stdout: string }) => ({ code: error.code, text: error.stdout }),
      )
      const uploaded = await felix.post('/api/verify', record.bundle)
      const server = await felix.get(`/api/records/${record.entryId}/verify`)
      expect(server.status).toBe(200)

      if (item.problem === null) {
        expect(cli.code, cli.text).toBe(0)
        expect(uploaded.status, JSON.stringify(uploaded.body)).toBe(200)
        expect(server.body.ok, JSON.stringify(server.body.problems)).toBe(true)
        return
      }
      expect(cli.code).toBe(1)
      expect(cli.text).toMatch(item.problem)
      expect(uploaded.status).toBe(422)
      const pageProblems: string[] = uploaded.body.data.report.problems
      expect(pageProblems.some(problem => item.problem!.test(problem)), pageProblems.join('\n')).toBe(true)
      expect(server.body.ok).toBe(false)
      const serverProblems: string[] = server.body.problems
      expect(serverProblems.some(problem => item.problem!.test(problem)), serverProblems.join('\n')).toBe(true)
      // The same words: the page's and the command line's problem appear in the server's report.
      const shared = pageProblems.find(problem => item.problem!.test(problem))!.replace(/^signatures\[\d+\] \([^)]*\): /, '')
      expect(cli.text).toContain(shared)
      expect(serverProblems.some(problem => problem.endsWith(shared))).toBe(true)
    })
  }
})
