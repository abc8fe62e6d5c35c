/** A plain list of checks: each passes, fails or is skipped with its reason. */
export interface Check { section: string, name: string, status: 'pass' | 'fail' | 'skip', detail: string }

export const checks: Check[] = []

export function check(section: string, name: string, ok: boolean, detail = ''): boolean {
  checks.push({ section, name, status: ok ? 'pass' : 'fail', detail })
  console.log(`${ok ? 'PASS' : 'FAIL'} [${section}] ${name}${detail ? ` — ${detail}` : ''}`)
  return ok
}

export function skip(section: string, name: string, reason: string) {
  checks.push({ section, name, status: 'skip', detail: reason })
  console.log(`SKIP [${section}] ${name} — ${reason}`)
}

export function counts() {
  return {
    passed: checks.filter(c => c.status === 'pass').length,
    failed: checks.filter(c => c.status === 'fail').length,
    skipped: checks.filter(c => c.status === 'skip').length,
  }
}
