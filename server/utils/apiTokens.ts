import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import { eq } from 'drizzle-orm'
import type { TokenScope } from '#shared/schemas/tokens'
import { apiTokens } from '../database/schema'
import type { SessionPerson } from './auth'

const TOKEN_PREFIX = 'tmt_'

export function hashApiToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex')
}

/** A new token: shown once to the admin; only its SHA-256 is stored. */
export function mintApiToken() {
  const secret = randomBytes(32).toString('base64url')
  const token = `${TOKEN_PREFIX}${secret}`
  return { token, prefix: token.slice(0, 12), tokenHash: hashApiToken(token) }
}

/**
 * Requests per token per minute, counted per app server (a fixed window in memory). With N
 * servers behind a balancer a token gets at most N times this; set it with
 * THERMOTOME_API_RATE_PER_MINUTE.
 */
const windows = new Map<string, { startedAt: number, count: number }>()
function takeRateSlot(tokenId: string): number {
  const limit = Number(process.env.THERMOTOME_API_RATE_PER_MINUTE ?? 120)
  const now = Date.now()
  const window = windows.get(tokenId)
  if (!window || now - window.startedAt >= 60_000) {
    windows.set(tokenId, { startedAt: now, count: 1 })
    return 0
  }
  window.count++
  return window.count > limit ? Math.ceil((window.startedAt + 60_000 - now) / 1000) : 0
}

/**
 * The person a bearer token acts for, after checking the token exists, is not revoked, holds
 * the scope, and is within its rate. 401 for a missing or wrong token, 403 for a missing scope.
 */
export async function requireApiToken(event: H3Event, scope: TokenScope): Promise<SessionPerson & { tokenId: string }> {
  const header = getRequestHeader(event, 'authorization') ?? ''
  const match = /^Bearer\s+(\S+)$/i.exec(header)
  if (!match)
    throw createError({ statusCode: 401, message: 'Send an API token as "Authorization: Bearer <token>".' })
  const database = useDatabase()
  const [token] = await database.select().from(apiTokens).where(eq(apiTokens.tokenHash, hashApiToken(match[1]!))).limit(1)
  if (!token)
    throw createError({ statusCode: 401, message: 'This API token is not known.' })
  if (token.revokedAt)
    throw createError({ statusCode: 401, message: 'This API token was revoked.' })
  if (!token.scopes.includes(scope))
    throw createError({ statusCode: 403, message: `This API token lacks the scope ${scope}.` })
  const wait = takeRateSlot(token.id)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({ statusCode: 429, message: `Too many requests with this token. Try again in ${wait} seconds.` })
  }
  const person = await findPerson(token.actsFor)
  if (!person || person.disabled)
    throw createError({ statusCode: 403, message: 'The person this token acts for is disabled.' })
  // Last use, at most once a minute per token, so reads don't become writes.
  if (!token.lastUsedAt || Date.now() - token.lastUsedAt.getTime() > 60_000)
    await database.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, token.id))
  const { disabled: _disabled, ...current } = person
  event.context.person = current
  return { ...current, tokenId: token.id }
}
