import { eq, sql } from 'drizzle-orm'
import { createPersonSchema } from '#shared/schemas/people'
import { people, personRoles } from '../../database/schema'

/** Adds a person; they choose their own password with a one-time link mailed to them. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const body = await validBody(event, createPersonSchema)
  const database = useDatabase()
  const [existing] = await database.select({ id: people.id }).from(people).where(eq(sql`lower(${people.email})`, body.email)).limit(1)
  if (existing)
    throw createError({ statusCode: 409, message: `email: ${body.email} already belongs to someone`, data: { issues: [{ path: 'email', message: 'already in use' }] } })
  // No password: the person chooses it with the link mailed to them below.
  const { person, link } = await database.transaction(async (tx) => {
    const [created] = await tx.insert(people).values({ email: body.email, name: body.name, passwordHash: null }).returning()
    if (body.roles.length)
      await tx.insert(personRoles).values(body.roles.map(role => ({ personId: created!.id, role })))
    await recordAudit(database, {
      action: 'person_created', actorId: admin.id, actorEmail: admin.email, subjectType: 'person', subjectId: created!.id,
      details: { email: body.email, name: body.name, roles: body.roles },
    }, tx)
    return { person: created!, link: await passwordResetIssue(tx, created!.id, admin.id) }
  })
  const mailed = await passwordResetMail(admin, person, link.token, link.expiresAt, true)
  setResponseStatus(event, 201)
  return {
    person: { id: person.id, email: person.email, name: person.name, disabled: person.disabled, roles: body.roles },
    passwordLink: { sentTo: person.email, mailed, expiresAt: link.expiresAt },
  }
})
