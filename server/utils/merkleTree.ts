import { createHash } from 'node:crypto'

// The audit log's Merkle tree (RFC 9162 §2.1) built once from its leaves, with node:crypto.
// Levels are kept bottom-up: level 0 holds the leaf hashes, level h the hashes of the complete,
// aligned subtrees of 2^h leaves. Any MTH(D[a:b]) the RFC's recursive definitions ask for is
// then a stored node or a few node hashes, so a root, an inclusion proof (PATH) or a
// consistency proof (PROOF) costs O(log n) hashes after the O(n) build. Checking proofs is
// shared/records/merkle.ts's.

const sha256 = (data: Uint8Array) => createHash('sha256').update(data).digest()

export function merkleLeaf(leaf: Uint8Array): Buffer {
  return sha256(Buffer.concat([Buffer.from([0x00]), leaf]))
}

function node(left: Uint8Array, right: Uint8Array): Buffer {
  return sha256(Buffer.concat([Buffer.from([0x01]), left, right]))
}

const EMPTY_ROOT = sha256(new Uint8Array(0))

function splitPoint(n: number): number {
  let k = 1
  while (k * 2 < n) k *= 2
  return k
}

export class MerkleTree {
  private readonly levels: Buffer[][]

  /** `leaves` are the entries' data (here the 32-byte audit event hashes), in log order. */
  constructor(leaves: Uint8Array[]) {
    this.levels = [leaves.map(merkleLeaf)]
    for (let level = this.levels[0]!; level.length > 1;) {
      const next: Buffer[] = []
      for (let index = 0; index + 1 < level.length; index += 2) next.push(node(level[index]!, level[index + 1]!))
      this.levels.push(next)
      level = next
    }
  }

  get size(): number {
    return this.levels[0]!.length
  }

  /** MTH(D[start:end]) (RFC 9162 §2.1.1), from the stored complete subtrees. */
  private hashOf(start: number, end: number): Buffer {
    const n = end - start
    if (n === 0) return EMPTY_ROOT
    if ((n & (n - 1)) === 0 && start % n === 0) {
      const level = Math.log2(n)
      const stored = this.levels[level]?.[start / n]
      if (stored) return stored
    }
    if (n === 1) return this.levels[0]![start]!
    const k = splitPoint(n)
    return node(this.hashOf(start, start + k), this.hashOf(start + k, end))
  }

  /** The root of the first `size` leaves (the tree head at that size). */
  root(size = this.size): Buffer {
    this.checkSize(size)
    return this.hashOf(0, size)
  }

  /** PATH(m, D[0:size]) (RFC 9162 §2.1.3.1): the inclusion proof of leaf m. */
  inclusionProof(m: number, size = this.size): Buffer[] {
    this.checkSize(size)
    if (m < 0 || m >= size) throw new RangeError(`leaf ${m} is not in a tree of ${size} leaves`)
    const path = (index: number, start: number, end: number): Buffer[] => {
      const n = end - start
      if (n === 1) return []
      const k = splitPoint(n)
      return index < k
        ? [...path(index, start, start + k), this.hashOf(start + k, end)]
        : [...path(index - k, start + k, end), this.hashOf(start, start + k)]
    }
    return path(m, 0, size)
  }

  /** PROOF(m, D[0:n]) (RFC 9162 §2.1.4.1): the consistency proof between tree heads m and n. */
  consistencyProof(m: number, n = this.size): Buffer[] {
    this.checkSize(n)
    if (m < 0 || m > n) throw new RangeError(`a tree of ${m} leaves is not a prefix of one of ${n}`)
    if (m === 0 || m === n) return []
    const subproof = (m: number, start: number, end: number, complete: boolean): Buffer[] => {
      const n = end - start
      if (m === n) return complete ? [] : [this.hashOf(start, end)]
      const k = splitPoint(n)
      return m <= k
        ? [...subproof(m, start, start + k, complete), this.hashOf(start + k, end)]
        : [...subproof(m - k, start + k, end, false), this.hashOf(start, start + k)]
    }
    return subproof(m, 0, n, true)
  }

  private checkSize(size: number) {
    if (!Number.isSafeInteger(size) || size < 0 || size > this.size) throw new RangeError(`the tree has ${this.size} leaves, not ${size}`)
  }
}
