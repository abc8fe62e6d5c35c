/**
 * Sign-in checks a password with scrypt, which is deliberately slow and CPU bound. Without a
 * gate, a burst of sign-ins queues on the CPU until every request (sign-in or not) waits tens
 * of seconds and clients time out. The gate lets a few checks run at once, queues a few more
 * for a short while, and answers the rest at once with 429 and Retry-After: a deliberate,
 * quick refusal instead of a slow failure.
 *
 * THERMOTOME_SIGNIN_CONCURRENCY (default 2) checks at once; THERMOTOME_SIGNIN_QUEUE (default
 * 32) waiting; a waiting request gives up after THERMOTOME_SIGNIN_WAIT_MS (default 10 s).
 */
const limit = (name: string, fallback: number) => {
  const value = Number(process.env[name])
  return Number.isFinite(value) && value > 0 ? value : fallback
}

let active = 0
const waiting: Array<() => void> = []

function signInBusy(): never {
  throw createError({
    statusCode: 429,
    message: 'Too many sign-ins at this moment. Try again in a few seconds.',
    data: { retryAfterSeconds: 2 },
  })
}

/** Run `work` (the password check) when a slot is free, or refuse with 429. */
export async function signInGate<T>(event: Parameters<typeof setResponseHeader>[0], work: () => Promise<T>): Promise<T> {
  if (active >= limit('THERMOTOME_SIGNIN_CONCURRENCY', 2)) {
    if (waiting.length >= limit('THERMOTOME_SIGNIN_QUEUE', 32)) {
      setResponseHeader(event, 'Retry-After', 2)
      signInBusy()
    }
    const admitted = await new Promise<boolean>((resolve) => {
      const go = () => { clearTimeout(timer); resolve(true) }
      const timer = setTimeout(() => {
        const index = waiting.indexOf(go)
        if (index >= 0) waiting.splice(index, 1)
        resolve(false)
      }, limit('THERMOTOME_SIGNIN_WAIT_MS', 10_000))
      waiting.push(go)
    })
    if (!admitted) {
      setResponseHeader(event, 'Retry-After', 2)
      signInBusy()
    }
  }
  else {
    active++
  }
  try {
    return await work()
  }
  finally {
    // Hand the slot straight to the next waiting request, or free it.
    const next = waiting.shift()
    if (next) next()
    else active--
  }
}
