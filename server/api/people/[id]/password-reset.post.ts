import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * An administrator has a one-time password link mailed to a person; the person sets the
 * password themselves. The administrator never sees the link or the password.
 */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, paramsSchema)
  const person = await findPerson(id)
  if (!person)
    throw createError({ statusCode: 404, message: 'No such person.' })
  if (person.disabled)
    throw createError({ statusCode: 409, message: 'This account is disabled; enable it before sending a password link.' })
  const database = useDatabase()
  const { token, expiresAt } = await database.transaction(async (tx) => {
    const issued = await passwordResetIssue(tx, id, admin.id)
    await recordAudit(database, {
      action: 'password_reset_sent', actorId: admin.id, actorEmail: admin.email, subjectType: 'person', subjectId: id,
      details: { to: person.email, expiresAt: issued.expiresAt.toISOString() },
    }, tx)
    return issued
  })
  const mailed = await passwordResetMail(admin, person, token, expiresAt, false)
  setResponseStatus(event, 202)
  return { sentTo: person.email, mailed, expiresAt }
})
