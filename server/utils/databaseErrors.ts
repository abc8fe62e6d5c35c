/** pg error codes and socket errors meaning "the database is not there right now". */
const UNAVAILABLE_CODES = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EAI_AGAIN',
  '57P01', // admin_shutdown
  '57P02', // crash_shutdown
  '57P03', // cannot_connect_now
  '53300', // too_many_connections
  '08000', '08001', '08003', '08004', '08006', // connection exceptions
])

const UNAVAILABLE_MESSAGES = /Connection terminated|connection timeout|Client has encountered a connection error|the database system is (starting up|shutting down)/i

/** True when an error (or its cause chain) says the database cannot be reached. */
export function isDatabaseUnavailable(error: unknown): boolean {
  let current: unknown = error
  for (let depth = 0; depth < 5 && current; depth++) {
    const candidate = current as { code?: unknown, message?: unknown, cause?: unknown, errors?: unknown[] }
    if (typeof candidate.code === 'string' && UNAVAILABLE_CODES.has(candidate.code))
      return true
    if (typeof candidate.message === 'string' && UNAVAILABLE_MESSAGES.test(candidate.message))
      return true
    if (Array.isArray(candidate.errors) && candidate.errors.some(isDatabaseUnavailable))
      return true
    current = candidate.cause
  }
  return false
}
