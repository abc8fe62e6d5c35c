// Print the plain closing line "N passed, N failed" (", N skipped") from vitest's JSON report.
import { existsSync, readFileSync } from 'node:fs'

const file = process.argv[2]
if (!file || !existsSync(file)) {
  console.log('0 passed, 1 failed')
  console.error('No test report was written: the test run stopped before it finished.')
  process.exit(1)
}
const report = JSON.parse(readFileSync(file, 'utf8'))
const failedSuites = (report.testResults ?? []).filter(r => r.status === 'failed' && !(r.assertionResults ?? []).some(a => a.status === 'failed')).length
const passed = report.numPassedTests ?? 0
const failed = (report.numFailedTests ?? 0) + failedSuites
const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0)
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`)
process.exit(failed > 0 ? 1 : 0)
