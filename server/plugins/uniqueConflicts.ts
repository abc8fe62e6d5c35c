/**
 * Two requests creating the same thing at the same moment (the same e-mail, notebook name…)
 * both pass the route's "does it exist?" check; the database's unique constraint stops the
 * second. Answer that as 409 with words a person can act on, never a bare 500.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error, { event }) => {
    if (!event || !isUniqueConflict(error))
      return
    const h3Error = error as { statusCode?: number, statusMessage?: string, message: string, unhandled?: boolean }
    h3Error.statusCode = 409
    h3Error.statusMessage = 'Conflict'
    h3Error.message = 'Something with the same name or address was saved at the same moment. Reload to see it, then try again if needed.'
    h3Error.unhandled = false
  })
})
