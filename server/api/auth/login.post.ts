import { eq, sql } from 'drizzle-orm'
import { signInSchema } from '#shared/schemas/people'
import { people } from '../../database/schema'

// Verifying against a fixed hash when the e-mail is unknown keeps the answer time alike.
let decoyHash: string | undefined

export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, signInSchema)
  // Behind a load balancer (THERMOTOME_TRUST_PROXY=1) the client address comes from X-Forwarded-For.
  const key = throttleKey(email, getRequestIP(event, { xForwardedFor: process.env.THERMOTOME_TRUST_PROXY === '1' }))
  const wait = await secondsToWait(key)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    tooManyAttempts(wait)
  }

  const [person] = await useDatabase().select().from(people).where(eq(sql`lower(${people.email})`, email)).limit(1)
  const passwordOk = await signInGate(event, async () => {
    decoyHash ??= await hashPassword('decoy password that never matches')
    return verifyPassword(person?.passwordHash ?? decoyHash, password)
  })

  if (!person || !passwordOk || person.disabled) {
    const reason = !person ? 'unknown e-mail' : !passwordOk ? 'wrong password' : 'account disabled'
    await recordAudit(useDatabase(), {
      action: 'sign_in_failed', actorId: person?.id ?? null, actorEmail: email,
      subjectType: 'person', subjectId: person?.id ?? null, details: { reason },
    })
    const waitNow = await recordFailure(key)
    if (waitNow > 0)
      setResponseHeader(event, 'Retry-After', waitNow)
    // Say "disabled" only to someone who knew the password.
    if (person && passwordOk && person.disabled)
      throw createError({ statusCode: 403, message: 'This account is disabled. Ask an administrator.' })
    throw createError({ statusCode: 401, message: 'The e-mail or the password is wrong.' })
  }

  await clearFailures(key)
  const current = (await findPerson(person.id))!
  await startSession(event, current)
  await recordAudit(useDatabase(), {
    action: 'sign_in', actorId: person.id, actorEmail: person.email, subjectType: 'person', subjectId: person.id,
  })
  return { person: { id: current.id, email: current.email, name: current.name, roles: current.roles } }
})
