import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { merkleLeafHash, merkleNodeHash, verifyConsistency, verifyInclusion } from '../../../shared/records/merkle'
import { MerkleTree } from '../../../server/utils/merkleTree'

// The audit log's Merkle tree against RFC 9162 §2.1 (identical to RFC 6962 §2.1 for the tree
// hash, PATH and PROOF). Reference values: the RFC 6962 test vectors used by Google's
// Certificate Transparency implementations (Trillian's merkle/testonly constants and
// certificate-transparency-go's merkletree tests: the eight inputs "", 00, 10, 2021, 3031,
// 40414243, 5051525354555657, 606162636465666768696a6b6c6d6e6f, their roots at every size,
// inclusion proofs for leaves 0 and 5 and consistency proofs 2→8 and 6→8 of the 8-leaf tree).

const sha256 = (data: Uint8Array) => new Uint8Array(createHash('sha256').update(data).digest())
const hex = (bytes: Uint8Array) => Buffer.from(bytes).toString('hex')
const unhex = (text: string) => new Uint8Array(Buffer.from(text, 'hex'))

const INPUTS = ['', '00', '10', '2021', '3031', '40414243', '5051525354555657', '606162636465666768696a6b6c6d6e6f'].map(unhex)
const ROOTS = [
  'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855',
  '6e340b9cffb37a989ca544e6bb780a2c78901d3fb33738768511a30617afa01d',
  'fac54203e7cc696cf0dfcb42c92a1d9dbaf70ad9e621f4bd8d98662f00e3c125',
  'aeb6bcfe274b70a14fb067a5e5578264db0fa9b51af5e0ba159158f329e06e77',
  'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7',
  '4e3bbb1f7b478dcfe71fb631631519a3bca12c9aefca1612bfce4c13a86264d4',
  '76e67dadbcdf1e10e1b74ddc608abd2f98dfb16fbce75277b5232a127f2087ef',
  'ddb89be403809e325750d3d263cd78929c2942b7942a34b77e122c9594a74c8c',
  '5dc9da79a70659a9ad559cb701ded9a2ab9d823aad2f4960cfe370eff4604328',
]
const INCLUSION = [
  { index: 0, size: 8, proof: ['96a296d224f285c67bee93c30f8a309157f0daa35dc5b87e410b78630a09cfc7', '5f083f0a1a33ca076a95279832580db3e0ef4584bdff1f54c8a360f50de3031e', '6b47aaf29ee3c2af9af889bc1fb9254dabd31177f16232dd6aab035ca39bf6e4'] },
  { index: 5, size: 8, proof: ['bc1a0643b12e4d2d7c77918f44e0f4f79a838b6cf9ec5b5c283e1f4d88599e6b', 'ca854ea128ed050b41b35ffc1b87b8eb2bde461e9e3b5596ece6b9d5975a0ae0', 'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7'] },
]
const CONSISTENCY = [
  { first: 2, second: 8, proof: ['5f083f0a1a33ca076a95279832580db3e0ef4584bdff1f54c8a360f50de3031e', '6b47aaf29ee3c2af9af889bc1fb9254dabd31177f16232dd6aab035ca39bf6e4'] },
  { first: 6, second: 8, proof: ['0ebc5d3437fbe2db158b9f126a1d118e308181031d0a949f8dededebc558ef6a', 'ca854ea128ed050b41b35ffc1b87b8eb2bde461e9e3b5596ece6b9d5975a0ae0', 'd37ee418976dd95753c1c73862b9398fa2a2cf9b4ff0fdfe8b30cd95209614b7'] },
]

// RFC 9162 §2.1.1 transcribed as written (recursive, no shortcuts), to check the level-based builder.
function referenceRoot(leaves: Uint8Array[]): Uint8Array {
  const n = leaves.length
  if (n === 0) return sha256(new Uint8Array(0))
  if (n === 1) return sha256(new Uint8Array([0x00, ...leaves[0]!]))
  let k = 1
  while (k * 2 < n) k *= 2
  return sha256(new Uint8Array([0x01, ...referenceRoot(leaves.slice(0, k)), ...referenceRoot(leaves.slice(k))]))
}

const eventLeaves = (count: number) => Array.from({ length: count }, (_, index) => sha256(new TextEncoder().encode(`Kestrel Ridge audit event ${index}`)))

describe('Merkle tree (RFC 9162 §2.1)', () => {
  it('gives the reference root at every size 0..8', () => {
    const tree = new MerkleTree(INPUTS)
    for (let size = 0; size <= 8; size++) expect(hex(tree.root(size)), `size ${size}`).toBe(ROOTS[size])
  })

  it('leaf and node hashes carry the 0x00 and 0x01 prefixes', async () => {
    expect(hex(await merkleLeafHash(sha256, new Uint8Array(0)))).toBe(ROOTS[1])
    const left = await merkleLeafHash(sha256, INPUTS[0]!)
    const right = await merkleLeafHash(sha256, INPUTS[1]!)
    expect(hex(await merkleNodeHash(sha256, left, right))).toBe(ROOTS[2])
  })

  it('makes the reference inclusion proofs, and they verify', async () => {
    const tree = new MerkleTree(INPUTS)
    for (const vector of INCLUSION) {
      expect(tree.inclusionProof(vector.index, vector.size).map(hex)).toEqual(vector.proof)
      const leaf = await merkleLeafHash(sha256, INPUTS[vector.index]!)
      expect(await verifyInclusion(sha256, vector.index, vector.size, leaf, vector.proof.map(unhex), unhex(ROOTS[vector.size]!))).toBe(true)
    }
  })

  it('makes the reference consistency proofs, and they verify', async () => {
    const tree = new MerkleTree(INPUTS)
    for (const vector of CONSISTENCY) {
      expect(tree.consistencyProof(vector.first, vector.second).map(hex)).toEqual(vector.proof)
      expect(await verifyConsistency(sha256, vector.first, vector.second, unhex(ROOTS[vector.first]!), unhex(ROOTS[vector.second]!), vector.proof.map(unhex))).toBe(true)
    }
  })

  it('agrees with the recursive definition for every size up to 70', () => {
    const leaves = eventLeaves(70)
    const tree = new MerkleTree(leaves)
    for (let size = 0; size <= 70; size++) expect(hex(tree.root(size))).toBe(hex(referenceRoot(leaves.slice(0, size))))
  })

  it('every inclusion and consistency proof verifies up to 40 leaves, and a changed one does not', async () => {
    const leaves = eventLeaves(40)
    const tree = new MerkleTree(leaves)
    for (let size = 1; size <= 40; size++) {
      const root = tree.root(size)
      for (let index = 0; index < size; index++) {
        const proof = tree.inclusionProof(index, size)
        const leaf = await merkleLeafHash(sha256, leaves[index]!)
        expect(await verifyInclusion(sha256, index, size, leaf, proof, root)).toBe(true)
        if (proof.length > 0) {
          const bent = proof.map(node => new Uint8Array(node))
          bent[0]![5]! ^= 1
          expect(await verifyInclusion(sha256, index, size, leaf, bent, root)).toBe(false)
          expect(await verifyInclusion(sha256, index, size, leaf, proof.slice(1), root)).toBe(false)
        }
      }
      for (let first = 1; first < size; first++) {
        const proof = tree.consistencyProof(first, size)
        expect(await verifyConsistency(sha256, first, size, tree.root(first), root, proof)).toBe(true)
        const bent = proof.map(node => new Uint8Array(node))
        bent[bent.length - 1]![0]! ^= 1
        expect(await verifyConsistency(sha256, first, size, tree.root(first), root, bent)).toBe(false)
      }
    }
  })

  it('a log with an event removed and the rest re-hashed is not consistent with its earlier head', async () => {
    const leaves = eventLeaves(20)
    const head = new MerkleTree(leaves)
    const rewritten = new MerkleTree([...leaves.slice(0, 7), ...eventLeaves(30).slice(21, 34)])
    // Whatever proof the rewritten log offers, the earlier head at size 12 does not fit it.
    const proof = rewritten.consistencyProof(12, rewritten.size)
    expect(await verifyConsistency(sha256, 12, rewritten.size, head.root(12), rewritten.root(), proof)).toBe(false)
  })

  it('refuses indexes outside the tree', async () => {
    const tree = new MerkleTree(INPUTS)
    expect(() => tree.inclusionProof(8, 8)).toThrow(RangeError)
    expect(() => tree.root(9)).toThrow(RangeError)
    expect(await verifyInclusion(sha256, 8, 8, new Uint8Array(32), [], tree.root())).toBe(false)
    expect(await verifyConsistency(sha256, 6, 8, tree.root(6), tree.root(), [])).toBe(false)
  })
})
