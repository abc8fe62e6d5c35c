import { eq } from 'drizzle-orm'
import { passwordChangeSchema } from '#shared/schemas/people'
import { people } from '../../database/schema'

/**
 * A signed-in person changes their own password. Every session of theirs ends (other
 * browsers, copied cookies); this browser gets a fresh session under the new epoch.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { currentPassword, newPassword } = await validBody(event, passwordChangeSchema)
  const database = useDatabase()
  const throttle = throttleKey(`password-change:${person.email}`, getRequestIP(event, { xForwardedFor: process.env.THERMOTOME_TRUST_PROXY === '1' }))
  const wait = await secondsToWait(throttle)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    tooManyAttempts(wait)
  }
  const [account] = await database.select({ passwordHash: people.passwordHash }).from(people).where(eq(people.id, person.id))
  if (!account?.passwordHash || !(await verifyPassword(account.passwordHash, currentPassword))) {
    await recordFailure(throttle)
    throw createError({ statusCode: 403, message: 'Your current password is wrong; nothing was changed.', data: { issues: [{ path: 'currentPassword', message: 'wrong password' }] } })
  }
  await clearFailures(throttle)
  const passwordHash = await hashPassword(newPassword)
  const epoch = await database.transaction(async (tx) => {
    await tx.update(people).set({ passwordHash, updatedAt: new Date() }).where(eq(people.id, person.id))
    const next = await endAllSessions(tx, person.id)
    await recordAudit(database, {
      action: 'password_changed', actorId: person.id, actorEmail: person.email, subjectType: 'person', subjectId: person.id,
      details: { sessionsEnded: 'all others' },
    }, tx)
    return next
  })
  await startSession(event, { ...person, sessionEpoch: epoch })
  return { passwordChanged: true }
})
