// The signed record: pure, isomorphic (browser and Node 20) — WebCrypto for SHA-256 and
// PBKDF2, tweetnacl for Ed25519 and secretbox. See DESIGN.md, "The signed record".

export { CanonicalJsonError, canonicalJson } from './canonical'
export { base64ToBytes, bytesEqual, bytesToBase64, bytesToHex, hexToBytes, utf8Bytes } from './encoding'
export { recordHash, sha256Hex, statementHash } from './hash'
export {
  WrongPassphraseError,
  formatFingerprint,
  generateSigningKeyPair,
  keyFingerprint,
  openSealedKey,
  parseFingerprint,
  publicKeyOf,
  sealSecretKey,
} from './keys'
export type { SigningKeyPair } from './keys'
export { buildBundle, buildRecord } from './record'
export type { BundleParts, RecordParts } from './record'
export * from './schema'
export { signStatement, statementBytes, verifySignature } from './signing'
export { verifyBundle } from './verify'
export type { SignatureCheck, VerificationReport } from './verify'
export { CalculationBlockError, buildEntryRecord, calculationBlocksOf, calculationsFromContent } from './entryRecord'
export type { CalculationBlockProblem, EntryRecordSource } from './entryRecord'
export { ed25519StrictProblem, strictEd25519, strictEd25519Verify } from './ed25519'
export type { Ed25519Verify } from './ed25519'
export type { VerifyOptions } from './verify'
export {
  RECORD_TOLERANCE, RECORD_TOLERANCE_WORDS, compareOfferedRecord, compareResults, describeQuantityDifference, numbersAgree, pathWords,
  recheckRecord, recheckSummary, relativeDifference, warningsAgree,
} from './recheck'
export type { BlockDifference, DescribeQuantity, QuantityDifference, RecheckAudience, RecheckSummary, RecordComparison, ResultPath } from './recheck'
export {
  AUDIT_GENESIS_HASH, CHECKPOINT_SCHEMA, CheckpointSchema, KEY_LIST_SCHEMA, KeyListSchema, RegisteredKeySchema,
  auditEventHashPayload, checkAuditEvents, keyCouldSignAt, openRecordsKeyDocument, recordsKeySignedBytes, registryCheck, registryOfKeyList,
  webCryptoSha256,
} from './anchor'
export type { AuditEventFields, AuditProofReport, Checkpoint, KeyList, KeyRegistry, OpenedDocument, RegisteredKey } from './anchor'
