/**
 * One presented table as CSV (RFC 4180): the header row carries each column's words, symbol and
 * unit, the cells the engine's numbers at full precision, so an auditor can re-check them.
 */
import { columnHeader, type PresentedTable } from './types'

/** A CSV cell, quoted where needed; text starting like a formula is defused (OWASP CSV injection). */
function cell(text: string): string {
  const safe = /^[=+\-@\t\r]/.test(text) && !/^-?\d/.test(text) ? `'${text}` : text
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe
}

export function presentedTableCsv(table: PresentedTable): string {
  const lines = [table.columns.map(column => cell(columnHeader(column))), ...table.exact.map(row => row.map(cell))]
  return `${lines.map(line => line.join(',')).join('\r\n')}\r\n`
}
