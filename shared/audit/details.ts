/**
 * An audit event's details in words, for people: the entry's history, the audit page and the
 * record PDF. The stored details stay as they are (the CSV export and integrators read them);
 * this only says them. Each known field has its words; an unknown one reads as its name spaced
 * out ("someField" → "some field"), so nothing prints as a raw key.
 */
import { utcText } from '../time'

type Details = Record<string, unknown>

/** Field names in words, in the order they are said. Fields not listed come after, spaced out. */
const FIELD_WORDS: [key: string, words: string][] = [
  ['title', 'title'],
  ['version', 'version'],
  ['supersedes', 'supersedes version'],
  ['previousState', 'previous state'],
  ['outcome', 'outcome'],
  ['reason', 'reason'],
  ['format', 'format'],
  ['witnessEmail', 'witness'],
  ['name', 'name'],
  ['email', 'e-mail'],
  ['roles', 'roles'],
  ['mediaType', 'media type'],
  ['size', 'bytes'],
  ['records', 'records'],
  ['matched', 'records found'],
  ['page', 'page'],
  ['filters', 'filters'],
  ['scopes', 'scopes'],
  ['recordHash', 'record hash'],
  ['statementHash', 'statement hash'],
  ['keyFingerprint', 'key fingerprint'],
  ['fingerprint', 'key fingerprint'],
  ['sha256', 'SHA-256'],
  ['recordedSha256', 'recorded SHA-256'],
  ['actualSha256', 'SHA-256 now'],
  ['via', 'through'],
]
const ORDER = new Map(FIELD_WORDS.map(([key], index) => [key, index]))
const WORDS = new Map(FIELD_WORDS)

/** Fields that repeat what the row already says or only link rows for machines. */
const LEFT_OUT = new Set(['signatureId', 'requestId', 'attachmentId', 'tokenId', 'witnessId', 'personId', 'notebookId', 'countersigns', 'memberIds', 'linkFrom', 'actsFor', 'prefix', 'closedBy', 'fromLockVersion', 'toLockVersion', 'lockVersion'])

const spaced = (key: string) => key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase()
const ISO_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?Z$/

function valueWords(value: unknown): string {
  if (value === null || value === undefined) return 'none'
  if (typeof value === 'boolean') return value ? 'yes' : 'no'
  if (typeof value === 'string') return ISO_TIME.test(value) ? utcText(value) : value
  if (typeof value === 'number') return String(value)
  if (Array.isArray(value)) return value.length ? value.map(valueWords).join(', ') : 'none'
  const entries = Object.entries(value as Details)
  return entries.length ? entries.map(([key, inner]) => `${WORDS.get(key) ?? spaced(key)} ${valueWords(inner)}`).join(', ') : 'none'
}

/** What an editing session's one event says: how many saves, when, and the content hashes. */
function editedWords(details: Details): string[] {
  const saves = Number(details.saves)
  const parts = [`${saves} ${saves === 1 ? 'save' : 'saves'}`]
  if (typeof details.firstSavedAt === 'string' && typeof details.lastSavedAt === 'string')
    parts.push(details.firstSavedAt === details.lastSavedAt ? `at ${utcText(details.firstSavedAt)}` : `from ${utcText(details.firstSavedAt)} to ${utcText(details.lastSavedAt)}`)
  if (details.version !== undefined) parts.push(`version ${valueWords(details.version)}`)
  if (details.titleChanged === true) parts.push('title changed')
  if (typeof details.firstContentHash === 'string') parts.push(`content hash after the first save ${details.firstContentHash}`)
  if (typeof details.lastContentHash === 'string' && details.lastContentHash !== details.firstContentHash) parts.push(`after the last ${details.lastContentHash}`)
  return parts
}
const EDITED_FIELDS = new Set(['saves', 'firstSavedAt', 'lastSavedAt', 'version', 'titleChanged', 'firstContentHash', 'lastContentHash'])

/**
 * The details in words: "version 1; record hash 3f…; key fingerprint SHA256:…". `omit` leaves
 * out fields the reader already sees (the entry's title in the entry's own history).
 */
export function auditDetailsWords(action: string, details: unknown, omit: readonly string[] = []): string {
  if (details === null || details === undefined) return ''
  if (typeof details !== 'object' || Array.isArray(details)) return valueWords(details)
  const record = details as Details
  const parts: string[] = action === 'entry_edited' ? editedWords(record) : []
  const keys = Object.keys(record)
    .filter(key => !LEFT_OUT.has(key) && !omit.includes(key) && !(action === 'entry_edited' && EDITED_FIELDS.has(key)))
    .sort((a, b) => (ORDER.get(a) ?? 999) - (ORDER.get(b) ?? 999) || a.localeCompare(b))
  for (const key of keys) {
    const value = record[key]
    if (key === 'title' && typeof value === 'string') parts.push(`“${value}”`)
    else parts.push(`${WORDS.get(key) ?? spaced(key)} ${valueWords(value)}`)
  }
  return parts.join('; ')
}
