import { eq, sql } from 'drizzle-orm'
import { createPersonSchema } from '#shared/schemas/people'
import { people, personRoles } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const body = await validBody(event, createPersonSchema)
  const database = useDatabase()
  const [existing] = await database.select({ id: people.id }).from(people).where(eq(sql`lower(${people.email})`, body.email)).limit(1)
  if (existing)
    throw createError({ statusCode: 409, message: `email: ${body.email} already belongs to someone`, data: { issues: [{ path: 'email', message: 'already in use' }] } })
  const passwordHash = await hashPassword(body.password)
  const person = await database.transaction(async (tx) => {
    const [created] = await tx.insert(people).values({ email: body.email, name: body.name, passwordHash }).returning()
    if (body.roles.length)
      await tx.insert(personRoles).values(body.roles.map(role => ({ personId: created!.id, role })))
    await recordAudit(database, {
      action: 'person_created', actorId: admin.id, actorEmail: admin.email, subjectType: 'person', subjectId: created!.id,
      details: { email: body.email, name: body.name, roles: body.roles },
    }, tx)
    return created!
  })
  setResponseStatus(event, 201)
  return { person: { id: person.id, email: person.email, name: person.name, disabled: person.disabled, roles: body.roles } }
})
