/**
 * Failures a person can act on, answered with their own status and words instead of a bare 500:
 * - the database cannot be reached (503; the pool reconnects by itself once it is back, nothing
 *   needs a restart);
 * - two requests created the same thing at the same moment (the same e-mail, notebook name…):
 *   both passed the route's "does it exist?" check and the unique constraint stopped the second
 *   (409);
 * - the disk holding uploaded files or exports is full (507; routes remove what they half-wrote).
 */
import type { H3Event } from 'h3'

interface KnownError {
  matches: (error: unknown) => boolean
  statusCode: number
  statusMessage: string
  message: string
  headers?: (event: H3Event) => void
}

const KNOWN_ERRORS: KnownError[] = [
  {
    matches: isDatabaseUnavailable, statusCode: 503, statusMessage: 'Service Unavailable',
    message: 'The database is not reachable right now. Nothing was changed; try again in a moment.',
    headers: event => setResponseHeader(event, 'Retry-After', 5),
  },
  {
    matches: isUniqueConflict, statusCode: 409, statusMessage: 'Conflict',
    message: 'Something with the same name or address was saved at the same moment. Reload to see it, then try again if needed.',
  },
  {
    matches: isStorageFull, statusCode: 507, statusMessage: 'Insufficient Storage',
    message: 'The file store is full, so the file was not saved and nothing was recorded. Ask an administrator to free space, then try again.',
  },
]

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error, { event }) => {
    if (!event) return
    const known = KNOWN_ERRORS.find(candidate => candidate.matches(error))
    if (!known) return
    const h3Error = error as { statusCode?: number, statusMessage?: string, message: string, unhandled?: boolean }
    h3Error.statusCode = known.statusCode
    h3Error.statusMessage = known.statusMessage
    h3Error.message = known.message
    h3Error.unhandled = false
    known.headers?.(event)
  })
})
