/** True when an error (or its cause chain) is PostgreSQL's unique_violation (SQLSTATE 23505). */
export function isUniqueConflict(error: unknown): boolean {
  let current: unknown = error
  for (let depth = 0; depth < 5 && current; depth++) {
    const candidate = current as { code?: unknown, cause?: unknown }
    if (candidate.code === '23505')
      return true
    current = candidate.cause
  }
  return false
}
