import { canonicalJson } from './canonical'
import { bytesToHex, utf8Bytes } from './encoding'
import type { RecordDocument, SigningStatement } from './schema'

/** SHA-256 (FIPS 180-4) as lower-case hex; strings are hashed as UTF-8. Uses WebCrypto. */
export async function sha256Hex(data: string | Uint8Array): Promise<string> {
  const bytes = typeof data === 'string' ? utf8Bytes(data) : new Uint8Array(data)
  return bytesToHex(new Uint8Array(await globalThis.crypto.subtle.digest('SHA-256', bytes)))
}

/** recordHash = SHA-256 of the RFC 8785 canonical JSON of the record (DESIGN, "The signed record" §2). */
export function recordHash(record: RecordDocument): Promise<string> {
  return sha256Hex(canonicalJson(record))
}

/** The hash a countersigning statement names in `countersigns`: SHA-256 of the statement's canonical JSON. */
export function statementHash(statement: SigningStatement): Promise<string> {
  return sha256Hex(canonicalJson(statement))
}
