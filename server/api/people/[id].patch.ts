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
  if (id === admin.id && (body.disabled === true || (body.roles && !body.roles.includes('admin'))))
    throw createError({ statusCode: 409, message: 'You cannot disable yourself or remove your own administrator role.' })

  const database = useDatabase()
  const passwordHash = body.password ? await hashPassword(body.password) : undefined
  await database.transaction(async (tx) => {
    const changes: Partial<typeof people.$inferInsert> = { updatedAt: new Date() }
    if (body.name !== undefined) changes.name = body.name
    if (body.disabled !== undefined) changes.disabled = body.disabled
    if (passwordHash) changes.passwordHash = passwordHash
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
    if (passwordHash)
      await audit('password_set', {})
  })
  const after = (await findPerson(id))!
  return { person: after }
})
