import { z } from 'zod'

const querySchema = z.object({ limit: z.coerce.number().int().min(1).max(1000).default(50) })

/** Checkpoints of the audit log (signed tree heads), newest first, and the records key that signs them. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance', 'admin')
  const { limit } = validQuery(event, querySchema)
  const rows = await auditCheckpointList(useDatabase(), limit)
  const key = loadRecordsKey()
  return {
    recordsKey: key ? { fingerprint: key.fingerprint, publicKeyPem: key.publicKeyPem } : null,
    checkpoints: rows.map(row => ({
      treeSize: row.treeSize, rootHash: row.rootHash, signedAt: row.signedAt.toISOString(), lastSequence: row.lastSequence,
      document: checkpointDocument(row),
    })),
  }
})
