/**
 * Resumes bulk exports after a restart: on start, and every half minute after, jobs still
 * queued or 'running' with a stale heartbeat (their server stopped) are claimed and continued.
 * Claiming is one conditional UPDATE, so several app servers never run the same job twice.
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
  nitroApp.hooks.hook('close', () => { clearTimeout(first); clearInterval(every) })
})
