/**
 * When PostgreSQL cannot be reached, answer 503 with words a person can act on instead of a
 * bare 500. The pool reconnects by itself once the server is back; nothing needs a restart.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error, { event }) => {
    if (!event || !isDatabaseUnavailable(error))
      return
    const h3Error = error as { statusCode?: number, statusMessage?: string, message: string, unhandled?: boolean, fatal?: boolean }
    h3Error.statusCode = 503
    h3Error.statusMessage = 'Service Unavailable'
    h3Error.message = 'The database is not reachable right now. Nothing was changed; try again in a moment.'
    h3Error.unhandled = false
    setResponseHeader(event, 'Retry-After', 5)
  })
})
