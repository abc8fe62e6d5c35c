import { alias } from 'drizzle-orm/pg-core'
import { asc, eq, inArray } from 'drizzle-orm'
import { KEY_LIST_SCHEMA, type KeyRegistry, type RecordsKeyDocument, type RegisteredKey } from '../../shared/records'
import { people, signingKeys } from '../database/schema'
import type { Database } from './db'
import { loadRecordsKey, signWithRecordsKey } from './recordsKey'

// The key registry is the signing_keys table (DESIGN.md "Trust anchors"): who owns which key,
// from when to when, who confirmed a replacement. Verification on the server checks every
// signature's key against it; offline, the same registry is published as a key list signed
// with the records key (GET /api/keys/list).

type Reader = Pick<Database, 'select' | 'selectDistinct'>

/** The registry's view of the keys of the people owning `fingerprints` (all keys when omitted). */
export async function registeredKeys(database: Reader, fingerprints?: string[]): Promise<RegisteredKey[]> {
  let ownerIds: string[] | undefined
  if (fingerprints) {
    if (fingerprints.length === 0) return []
    const owners = await database.selectDistinct({ personId: signingKeys.personId }).from(signingKeys).where(inArray(signingKeys.fingerprint, fingerprints))
    ownerIds = owners.map(owner => owner.personId)
    if (ownerIds.length === 0) return []
  }
  const confirmer = alias(people, 'confirmer')
  const rows = await database.select({
    key: signingKeys,
    owner: { id: people.id, name: people.name, email: people.email },
    confirmer: { id: confirmer.id, name: confirmer.name, email: confirmer.email },
  }).from(signingKeys)
    .innerJoin(people, eq(people.id, signingKeys.personId))
    .leftJoin(confirmer, eq(confirmer.id, signingKeys.confirmedBy))
    .where(ownerIds ? inArray(signingKeys.personId, ownerIds) : undefined)
    .orderBy(asc(signingKeys.personId), asc(signingKeys.createdAt), asc(signingKeys.id))
  const seen = new Set<string>()
  return rows.map(({ key, owner, confirmer }) => {
    // A person's first key needed no confirmation; every later one replaced an earlier key.
    const replacement = seen.has(key.personId)
    seen.add(key.personId)
    return {
      fingerprint: key.fingerprint, publicKey: key.publicKey, owner,
      createdAt: key.createdAt.toISOString(), retiredAt: key.retiredAt?.toISOString() ?? null, retiredReason: key.retiredReason,
      replacement, confirmedAt: key.confirmedAt?.toISOString() ?? null,
      confirmedBy: key.confirmedBy && confirmer?.id ? confirmer : null, confirmationReason: key.confirmationReason,
    }
  })
}

/** The database as the registry verifyBundle checks against. */
export async function databaseKeyRegistry(database: Reader, fingerprints: string[]): Promise<KeyRegistry> {
  return { source: 'the key registry of this Thermotome', keys: await registeredKeys(database, fingerprints) }
}

/** The whole registry as a key list signed with the records key; null without a records key. */
export async function signedKeyList(database: Reader): Promise<RecordsKeyDocument | null> {
  const key = loadRecordsKey()
  if (!key) return null
  return signWithRecordsKey(key, { schema: KEY_LIST_SCHEMA, issuedAt: new Date().toISOString(), recordsKey: key.fingerprint, keys: await registeredKeys(database) })
}
