/** Node error codes meaning "the disk (or quota) for stored files is full". */
const FULL_CODES = new Set(['ENOSPC', 'EDQUOT', 'EFBIG'])

/** True when an error (or its cause chain) says there is no room left to store a file. */
export function isStorageFull(error: unknown): boolean {
  let current: unknown = error
  for (let depth = 0; depth < 5 && current; depth++) {
    const candidate = current as { code?: unknown, cause?: unknown }
    if (typeof candidate.code === 'string' && FULL_CODES.has(candidate.code))
      return true
    current = candidate.cause
  }
  return false
}
