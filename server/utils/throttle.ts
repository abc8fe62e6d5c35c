import { eq, sql } from 'drizzle-orm'
import { signInThrottle } from '../database/schema'

/** Failed sign-ins allowed per e-mail and client address before a wait is imposed. */
export const FREE_FAILURES = 5
const WINDOW_MS = 15 * 60 * 1000
const BASE_WAIT_MS = 30 * 1000
const MAX_WAIT_MS = 15 * 60 * 1000

export function throttleKey(email: string, address: string | undefined) {
  return `${email.toLowerCase()}|${address ?? 'unknown'}`
}

/** Seconds left to wait, or 0 when a sign-in may be tried now. */
export async function secondsToWait(key: string, now = new Date()): Promise<number> {
  const [row] = await useDatabase().select().from(signInThrottle).where(eq(signInThrottle.key, key)).limit(1)
  if (!row?.lockedUntil || row.lockedUntil <= now)
    return 0
  return Math.ceil((row.lockedUntil.getTime() - now.getTime()) / 1000)
}

/**
 * Count a failure. After FREE_FAILURES within the window, each further failure doubles the
 * wait (30 s, 60 s, … up to 15 minutes). One upsert, so parallel app servers agree.
 */
export async function recordFailure(key: string, now = new Date()): Promise<number> {
  const windowStart = new Date(now.getTime() - WINDOW_MS)
  const [row] = await useDatabase().insert(signInThrottle)
    .values({ key, failures: 1, windowStartedAt: now })
    .onConflictDoUpdate({
      target: signInThrottle.key,
      set: {
        failures: sql`CASE WHEN ${signInThrottle.windowStartedAt} < ${windowStart} THEN 1 ELSE ${signInThrottle.failures} + 1 END`,
        windowStartedAt: sql`CASE WHEN ${signInThrottle.windowStartedAt} < ${windowStart} THEN ${now} ELSE ${signInThrottle.windowStartedAt} END`,
      },
    })
    .returning()
  const failures = row?.failures ?? 1
  if (failures < FREE_FAILURES)
    return 0
  const waitMs = Math.min(MAX_WAIT_MS, BASE_WAIT_MS * 2 ** (failures - FREE_FAILURES))
  const lockedUntil = new Date(now.getTime() + waitMs)
  await useDatabase().update(signInThrottle).set({ lockedUntil }).where(eq(signInThrottle.key, key))
  return Math.ceil(waitMs / 1000)
}

export async function clearFailures(key: string) {
  await useDatabase().delete(signInThrottle).where(eq(signInThrottle.key, key))
}

export function tooManyAttempts(seconds: number): never {
  throw createError({
    statusCode: 429,
    message: `Too many failed sign-ins. Try again in ${seconds} seconds.`,
    data: { retryAfterSeconds: seconds },
  })
}
