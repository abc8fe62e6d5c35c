/**
 * Resumes bulk exports after a restart: on start, and every half minute after, jobs still
 * queued or 'running' with a stale heartbeat (their server stopped) are claimed and continued.
 * Claiming is one conditional UPDATE, so several app servers never run the same job twice.
 *
 * It also removes the files of exports finished longer ago than THERMOTOME_EXPORT_RETENTION_DAYS
 * (default 7): once shortly after start, then hourly (expireExportFiles, also one conditional
 * UPDATE per job).
 */
export default defineNitroPlugin((nitroApp) => {
  if (!process.env.DATABASE_URL || import.meta.prerender) return
  const pickUp = () => resumeExportJobs().then((count) => {
    if (count) console.info(`[exports] resuming ${count} export job(s)`)
  }).catch(error => console.error('[exports] could not look for unfinished exports:', error instanceof Error ? error.message : error))
  // After the other plugins (the exports storage mount) have run.
  const first = setTimeout(pickUp, 1_000)
  const every = setInterval(pickUp, EXPORT_HEARTBEAT_STALE_MS)
  first.unref?.()
  every.unref?.()
  // Read once here so a bad value is reported at start, not only at the first sweep.
  const retentionDays = exportRetentionDays()
  const sweep = () => expireExportFiles().then((removed) => {
    if (removed.length) console.info(`[exports] removed the files of ${removed.length} export(s) finished more than ${retentionDaysText(retentionDays)} ago`)
  }).catch(error => console.error('[exports] could not remove the files of old exports:', error instanceof Error ? error.message : error))
  const firstSweep = setTimeout(sweep, 10_000)
  const hourly = setInterval(sweep, 60 * 60_000)
  firstSweep.unref?.()
  hourly.unref?.()
  nitroApp.hooks.hook('close', () => { clearTimeout(first); clearInterval(every); clearTimeout(firstSweep); clearInterval(hourly) })
})
