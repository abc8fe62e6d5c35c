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
export { CalculationBlockError, buildEntryRecord, calculationBlocksOf, calculationsFromContent, recomputeCalculations } from './entryRecord'
export type { CalculationBlockProblem, CalculationDifference, EntryRecordSource } from './entryRecord'
