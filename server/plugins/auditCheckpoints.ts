/**
 * Signs a checkpoint of the audit log every THERMOTOME_CHECKPOINT_MINUTES (default 60) when it
 * has grown, so truncation and rewrites are found against a recent signed head. Exports sign
 * one when theirs would not be covered; compliance can sign one at any time.
 */
export default defineNitroPlugin((nitroApp) => {
  if (!process.env.DATABASE_URL || import.meta.prerender) return
  const minutes = Number(process.env.THERMOTOME_CHECKPOINT_MINUTES ?? 60)
  if (!Number.isFinite(minutes) || minutes <= 0) {
    console.error(`[audit] THERMOTOME_CHECKPOINT_MINUTES must be a positive number of minutes, got ${process.env.THERMOTOME_CHECKPOINT_MINUTES}; no periodic checkpoints`)
    return
  }
  if (!loadRecordsKey()) {
    console.warn('[audit] no records key (THERMOTOME_RECORDS_KEY_FILE or records-key.pem in the data folder): audit checkpoints are not signed')
    return
  }
  const sign = () => signAuditCheckpoint(useDatabase()).catch(error => console.error('[audit] could not sign a checkpoint:', error instanceof Error ? error.message : error))
  const every = setInterval(sign, minutes * 60_000)
  every.unref?.()
  nitroApp.hooks.hook('close', () => clearInterval(every))
})
