// Every action the server writes to the audit trail has plain words for people to read.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { AUDIT_ACTION_WORDS, auditActionWords } from '../../../shared/audit/actions'

const server = fileURLToPath(new URL('../../../server', import.meta.url))

function sources(folder: string): string[] {
  return readdirSync(folder, { recursive: true, withFileTypes: true })
    .filter(item => item.isFile() && item.name.endsWith('.ts'))
    .map(item => readFileSync(join(item.parentPath, item.name), 'utf8'))
}

/** Action codes written by the server: `action: 'x'`, `audit('x', …)`, `auditRecordExport(…, 'x', …)` and the read-only list. */
function actionCodes(): Set<string> {
  const codes = new Set<string>()
  const patterns = [/action: '([a-z_]+)'/g, /\baudit\('([a-z_]+)'/g, /auditRecordExport\([^)]*?'([a-z_]+)'/g, /'([a-z_]+)' : '([a-z_]+)'/g]
  for (const text of sources(server)) {
    for (const pattern of patterns) for (const match of text.matchAll(pattern)) for (const code of match.slice(1)) if (code) codes.add(code)
    const readOnly = /READ_ONLY_RECORD_ACTIONS = \[([^\]]*)\]/.exec(text)
    if (readOnly) for (const match of readOnly[1]!.matchAll(/'([a-z_]+)'/g)) codes.add(match[1]!)
  }
  return codes
}

describe('audit action words', () => {
  it('has words for every action code the server writes', () => {
    const codes = actionCodes()
    expect(codes.size).toBeGreaterThan(25)
    const missing = [...codes].filter(code => code.includes('_') || ['sign_in'].includes(code)).filter(code => !(code in AUDIT_ACTION_WORDS))
    expect(missing).toEqual([])
  })

  it('reads an unknown code as words rather than failing', () => {
    expect(auditActionWords('entry_signed')).toBe('Signed by the author')
    expect(auditActionWords('future_thing_done')).toBe('Future thing done')
  })
})
