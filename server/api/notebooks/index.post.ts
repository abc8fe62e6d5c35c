import { eq, inArray, sql } from 'drizzle-orm'
import { createNotebookSchema } from '#shared/schemas/notebooks'
import { notebookMembers, notebooks, people } from '../../database/schema'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const body = await validBody(event, createNotebookSchema)
  const database = useDatabase()
  const [clash] = await database.select({ id: notebooks.id }).from(notebooks).where(eq(sql`lower(${notebooks.name})`, body.name.toLowerCase())).limit(1)
  if (clash)
    throw createError({ statusCode: 409, message: `name: a notebook called "${body.name}" exists already`, data: { issues: [{ path: 'name', message: 'already in use' }] } })
  const memberIds = [...new Set(body.memberIds)]
  if (memberIds.length) {
    const found = await database.select({ id: people.id }).from(people).where(inArray(people.id, memberIds))
    const missing = memberIds.filter(id => !found.some(f => f.id === id))
    if (missing.length)
      validationError([{ path: 'memberIds', message: `no such person: ${missing.join(', ')}` }], 'body')
  }
  const notebook = await database.transaction(async (tx) => {
    const [created] = await tx.insert(notebooks).values({ name: body.name, description: body.description, createdBy: admin.id }).returning()
    if (memberIds.length)
      await tx.insert(notebookMembers).values(memberIds.map(personId => ({ notebookId: created!.id, personId })))
    await recordAudit(database, {
      action: 'notebook_created', actorId: admin.id, actorEmail: admin.email, subjectType: 'notebook', subjectId: created!.id,
      details: { name: body.name, memberIds },
    }, tx)
    return created!
  })
  setResponseStatus(event, 201)
  return { notebook: { ...notebook, memberIds } }
})
