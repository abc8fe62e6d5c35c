/**
 * What a failed query may put in a log. drizzle's DrizzleQueryError carries the statement and
 * its bound parameters in `params`, in its message ("Failed query: …\nparams: …") and in its
 * stack; a failing UPDATE of people would print a password hash, and any query of people an
 * e-mail address or a reset token's hash. Nitro logs an unhandled error with its stack, so the
 * parameters are withheld from every error in the chain (error, cause, cause's cause…) before
 * anything logs it. The statement itself (table and column names) stays: it says what failed.
 */
const PARAMS_IN_TEXT = /\nparams: [\s\S]*?(?=\n {4}at |$)/

export function redactQueryParameters(error: unknown): void {
  let current: unknown = error
  for (let depth = 0; depth < 6 && current && typeof current === 'object'; depth++) {
    const target = current as { params?: unknown, message?: unknown, stack?: unknown, cause?: unknown }
    if ('params' in target && Array.isArray(target.params))
      target.params = ['(withheld)']
    for (const field of ['message', 'stack'] as const) {
      const text = target[field]
      if (typeof text === 'string' && PARAMS_IN_TEXT.test(text)) {
        try { Object.defineProperty(target, field, { value: text.replace(PARAMS_IN_TEXT, '\nparams: (withheld)'), writable: true, configurable: true }) }
        catch { /* a frozen error keeps its text */ }
      }
    }
    current = target.cause
  }
}
