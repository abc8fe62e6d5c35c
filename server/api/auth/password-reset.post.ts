import { and, eq, isNull } from 'drizzle-orm'
import { passwordResetSchema } from '#shared/schemas/people'
import { passwordResets, people } from '../../database/schema'

/**
 * Set a password with a mailed one-time link. The link is spent, every other link of the
 * person closes, and every session of theirs ends. 400 for a token that was never issued or is
 * spent, 410 for an expired one.
 */
export default defineEventHandler(async (event) => {
  const { token, password } = await validBody(event, passwordResetSchema)
  const database = useDatabase()
  const [reset] = await database.select().from(passwordResets).where(eq(passwordResets.tokenHash, hashResetToken(token))).limit(1)
  if (!reset || reset.usedAt)
    validationError([{ path: 'token', message: 'this link is not valid or was already used; ask an administrator for a new one' }], 'body')
  if (reset.expiresAt.getTime() <= Date.now())
    throw createError({ statusCode: 410, message: 'This link has expired. Ask an administrator for a new one.', data: { issues: [{ path: 'token', message: 'expired' }] } })
  const person = await findPerson(reset.personId)
  if (!person || person.disabled)
    throw createError({ statusCode: 403, message: 'This account is disabled. Ask an administrator.' })
  const passwordHash = await hashPassword(password)
  await database.transaction(async (tx) => {
    const spent = await tx.update(passwordResets).set({ usedAt: new Date() })
      .where(and(eq(passwordResets.id, reset.id), isNull(passwordResets.usedAt))).returning({ id: passwordResets.id })
    if (!spent.length)
      validationError([{ path: 'token', message: 'this link was already used' }], 'body')
    await tx.update(passwordResets).set({ usedAt: new Date() }).where(and(eq(passwordResets.personId, person.id), isNull(passwordResets.usedAt)))
    await tx.update(people).set({ passwordHash, updatedAt: new Date() }).where(eq(people.id, person.id))
    await endAllSessions(tx, person.id)
    await recordAudit(database, {
      action: 'password_set_by_link', actorId: person.id, actorEmail: person.email, subjectType: 'person', subjectId: person.id,
      details: { linkFrom: reset.requestedBy, sessionsEnded: 'all' },
    }, tx)
  })
  return { passwordSet: true, email: person.email }
})
