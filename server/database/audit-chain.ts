import { createHash } from 'node:crypto'
import canonicalize from 'canonicalize'
import type { AuditEvent } from './schema'

/** previousHash of the first event in the chain. */
export const GENESIS_HASH = '0'.repeat(64)

/** The fields a row's hash covers, in the form that is hashed (RFC 8785 canonical JSON). */
export function auditHashPayload(row: Omit<AuditEvent, 'sequence' | 'hash'>): string {
  const payload = {
    occurredAt: row.occurredAt.toISOString(),
    actorId: row.actorId ?? null,
    actorEmail: row.actorEmail ?? null,
    action: row.action,
    subjectType: row.subjectType ?? null,
    subjectId: row.subjectId ?? null,
    details: row.details ?? {},
    previousHash: row.previousHash,
  }
  const text = canonicalize(payload)
  if (text === undefined)
    throw new Error('audit event cannot be canonicalised')
  return text
}

export function auditRowHash(row: Omit<AuditEvent, 'sequence' | 'hash'>): string {
  return createHash('sha256').update(auditHashPayload(row), 'utf8').digest('hex')
}

