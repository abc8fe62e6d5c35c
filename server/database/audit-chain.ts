import { createHash } from 'node:crypto'
import { AUDIT_GENESIS_HASH, auditEventHashPayload } from '../../shared/records/anchor'
import type { AuditEvent } from './schema'

/** previousHash of the first event in the chain. */
export const GENESIS_HASH = AUDIT_GENESIS_HASH

/**
 * The fields a row's hash covers, in the form that is hashed (RFC 8785 canonical JSON). One
 * definition (shared/records/anchor.ts), so an auditor re-hashes a bundle's events the same way.
 */
export function auditHashPayload(row: Omit<AuditEvent, 'sequence' | 'hash'>): string {
  return auditEventHashPayload({ ...row, occurredAt: row.occurredAt.toISOString() })
}

export function auditRowHash(row: Omit<AuditEvent, 'sequence' | 'hash'>): string {
  return createHash('sha256').update(auditHashPayload(row), 'utf8').digest('hex')
}
