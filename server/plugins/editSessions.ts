/**
 * Closes editing sessions idle for longer than EDIT_SESSION_GAP_MINUTES, once a minute, so an
 * entry someone stopped editing gets its one `entry_edited` audit event without waiting for
 * the next save. Each close is a conditional DELETE: several app servers never close one twice.
 */
export default defineNitroPlugin((nitroApp) => {
  if (!process.env.DATABASE_URL || import.meta.prerender) return
  const sweep = () => closeIdleEditSessions(useDatabase()).catch(error =>
    console.error('[audit] could not close idle editing sessions:', error instanceof Error ? error.message : error))
  const every = setInterval(sweep, 60_000)
  every.unref?.()
  nitroApp.hooks.hook('close', () => clearInterval(every))
})
