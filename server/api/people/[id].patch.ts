import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { updatePersonSchema } from '#shared/schemas/people'
import { uuidSchema } from '#shared/schemas/notebooks'
import { people, personRoles } from '../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await validParams(event, paramsSchema)
  const body = await validBody(event, updatePersonSchema)
  const before = await findPerson(id)
  if (!before)
    throw createError({ statusCode: 404, message: 'No such person.' })
  // Nobody grants themselves a role (nor drops one to dodge a rule): another administrator
  // changes an administrator's roles. Passwords are never set here (see password-reset.post.ts).
  if (id === admin.id && body.roles && body.roles.join() !== before.roles.join())
    throw createError({ statusCode: 403, message: 'roles: nobody changes their own roles; ask another administrator.', data: { issues: [{ path: 'roles', message: 'nobody changes their own roles' }] } })
  if (id === admin.id && body.disabled === true)
    throw createError({ statusCode: 409, message: 'You cannot disable yourself.' })

  const database = useDatabase()
  await database.transaction(async (tx) => {
    const changes: Partial<typeof people.$inferInsert> = { updatedAt: new Date() }
    if (body.name !== undefined) changes.name = body.name
    if (body.disabled !== undefined) changes.disabled = body.disabled
    await tx.update(people).set(changes).where(eq(people.id, id))
    const audit = (action: string, details: Record<string, unknown>) => recordAudit(database, {
      action, actorId: admin.id, actorEmail: admin.email, subjectType: 'person', subjectId: id, details,
    }, tx)
    if (body.roles) {
      await tx.delete(personRoles).where(eq(personRoles.personId, id))
      if (body.roles.length)
        await tx.insert(personRoles).values(body.roles.map(role => ({ personId: id, role })))
      if (body.roles.join() !== before.roles.join())
        await audit('roles_changed', { from: before.roles, to: body.roles })
    }
    if (body.disabled !== undefined && body.disabled !== before.disabled)
      await audit(body.disabled ? 'person_disabled' : 'person_enabled', {})
    if (body.name !== undefined && body.name !== before.name)
      await audit('person_renamed', { from: before.name, to: body.name })
  })
  const { sessionEpoch: _epoch, ...after } = (await findPerson(id))!
  return { person: after }
})
