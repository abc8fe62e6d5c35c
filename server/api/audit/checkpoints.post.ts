/**
 * Signs a checkpoint of the audit log now (the server also signs one periodically and whenever
 * an export needs one). 201 with the checkpoint; the same one when the log has not grown.
 */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance')
  const row = await signAuditCheckpoint(useDatabase())
  if (!row)
    throw createError({ statusCode: 503, message: 'No records key is configured (THERMOTOME_RECORDS_KEY_FILE or records-key.pem in the data folder), so no checkpoint can be signed.' })
  setResponseStatus(event, 201)
  return { treeSize: row.treeSize, rootHash: row.rootHash, signedAt: row.signedAt.toISOString(), lastSequence: row.lastSequence, document: checkpointDocument(row) }
})
