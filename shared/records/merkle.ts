// Merkle tree hashes of the audit log, as RFC 9162 (Certificate Transparency 2.0) §2.1 defines
// them: leaves and inner nodes hashed with different one-byte prefixes (0x00 and 0x01), so that
// a leaf can never pass for a node. The leaves are the audit events' own hashes (32 bytes each).
// Pure and isomorphic: the hash function is passed in, node:crypto on the server and CLI,
// WebCrypto where only that exists. Building proofs is the server's (server/utils/merkleTree.ts);
// checking them, here, needs nothing but the proof, the leaf and a signed tree head.

/** SHA-256 of the bytes (FIPS 180-4). Synchronous or not, as the caller has it. */
export type Sha256 = (data: Uint8Array) => Uint8Array | Promise<Uint8Array>

const LEAF_PREFIX = 0x00
const NODE_PREFIX = 0x01

function joined(prefix: number, ...parts: Uint8Array[]): Uint8Array {
  const bytes = new Uint8Array(1 + parts.reduce((total, part) => total + part.length, 0))
  bytes[0] = prefix
  let at = 1
  for (const part of parts) {
    bytes.set(part, at)
    at += part.length
  }
  return bytes
}

/** MTH({d}) = SHA-256(0x00 || d) (RFC 9162 §2.1.1). */
export async function merkleLeafHash(sha256: Sha256, leaf: Uint8Array): Promise<Uint8Array> {
  return await sha256(joined(LEAF_PREFIX, leaf))
}

/** SHA-256(0x01 || left || right) (RFC 9162 §2.1.1). */
export async function merkleNodeHash(sha256: Sha256, left: Uint8Array, right: Uint8Array): Promise<Uint8Array> {
  return await sha256(joined(NODE_PREFIX, left, right))
}

/** The largest power of two smaller than n (n > 1): the split point k of RFC 9162 §2.1.1. */
export function largestPowerOfTwoBelow(n: number): number {
  let k = 1
  while (k * 2 < n) k *= 2
  return k
}

function sameBytes(left: Uint8Array, right: Uint8Array): boolean {
  if (left.length !== right.length) return false
  let difference = 0
  for (let index = 0; index < left.length; index++) difference |= left[index]! ^ right[index]!
  return difference === 0
}

/**
 * Verifies an inclusion proof (RFC 9162 §2.1.3.2): that the leaf with hash `leafHash` is leaf
 * number `leafIndex` (from 0) of the tree of `treeSize` leaves whose root is `rootHash`.
 */
export async function verifyInclusion(
  sha256: Sha256,
  leafIndex: number,
  treeSize: number,
  leafHash: Uint8Array,
  proof: Uint8Array[],
  rootHash: Uint8Array,
): Promise<boolean> {
  if (!Number.isSafeInteger(leafIndex) || !Number.isSafeInteger(treeSize) || leafIndex < 0 || leafIndex >= treeSize) return false
  // Numbers past 2^31 would overflow JavaScript's 32-bit shifts: arithmetic keeps them exact.
  let fn = leafIndex
  let sn = treeSize - 1
  let r = leafHash
  for (const p of proof) {
    if (sn === 0) return false
    if (fn % 2 === 1 || fn === sn) {
      r = await merkleNodeHash(sha256, p, r)
      if (fn % 2 === 0) {
        while (fn % 2 === 0 && fn !== 0) {
          fn = Math.floor(fn / 2)
          sn = Math.floor(sn / 2)
        }
      }
    }
    else {
      r = await merkleNodeHash(sha256, r, p)
    }
    fn = Math.floor(fn / 2)
    sn = Math.floor(sn / 2)
  }
  return sn === 0 && sameBytes(r, rootHash)
}

/**
 * Verifies a consistency proof (RFC 9162 §2.1.4.2): that the tree of `firstSize` leaves with root
 * `firstRoot` is a prefix of the tree of `secondSize` leaves with root `secondRoot`, i.e. the
 * log was only appended to between the two tree heads (nothing removed, nothing rewritten).
 */
export async function verifyConsistency(
  sha256: Sha256,
  firstSize: number,
  secondSize: number,
  firstRoot: Uint8Array,
  secondRoot: Uint8Array,
  proof: Uint8Array[],
): Promise<boolean> {
  if (!Number.isSafeInteger(firstSize) || !Number.isSafeInteger(secondSize) || firstSize < 0 || firstSize > secondSize) return false
  if (firstSize === secondSize) return proof.length === 0 && sameBytes(firstRoot, secondRoot)
  if (firstSize === 0) return proof.length === 0
  // Step 1: between two different sizes a proof is never empty.
  if (proof.length === 0) return false
  // Step 2: when the first tree is a complete subtree (a power of two), its root starts the path.
  const path = isPowerOfTwo(firstSize) ? [firstRoot, ...proof] : proof
  let fn = firstSize - 1
  let sn = secondSize - 1
  while (fn % 2 === 1) {
    fn = Math.floor(fn / 2)
    sn = Math.floor(sn / 2)
  }
  let fr = path[0]!
  let sr = path[0]!
  for (const c of path.slice(1)) {
    if (sn === 0) return false
    if (fn % 2 === 1 || fn === sn) {
      fr = await merkleNodeHash(sha256, c, fr)
      sr = await merkleNodeHash(sha256, c, sr)
      if (fn % 2 === 0) {
        while (fn % 2 === 0 && fn !== 0) {
          fn = Math.floor(fn / 2)
          sn = Math.floor(sn / 2)
        }
      }
    }
    else {
      sr = await merkleNodeHash(sha256, sr, c)
    }
    fn = Math.floor(fn / 2)
    sn = Math.floor(sn / 2)
  }
  return sn === 0 && sameBytes(fr, firstRoot) && sameBytes(sr, secondRoot)
}

function isPowerOfTwo(n: number): boolean {
  return n > 0 && largestPowerOfTwoBelow(n + 1) === n
}
