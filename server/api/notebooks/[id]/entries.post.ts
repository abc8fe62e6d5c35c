import { z } from 'zod'
import { createEntrySchema, emptyDocument } from '#shared/schemas/entries'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const body = await validBody(event, createEntrySchema)
  const notebook = await readableNotebook(person, id)
  if (!(await isMember(notebook.id, person.id)))
    throw createError({ statusCode: 403, message: 'Only members of this notebook can write entries in it.' })
  // A draft always saves: blocks that do not compute yet are stored as typed and named.
  const incompleteBlocks = body.content !== undefined ? assertEditorDocumentValid(body.content) : []
  const database = useDatabase()
  const entry = await database.transaction(async (tx) => {
    const [created] = await tx.insert(entries).values({
      notebookId: id, authorId: person.id, title: body.title, content: body.content ?? emptyDocument(),
    }).returning()
    await recordAudit(database, {
      action: 'entry_created', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: created!.id,
      details: { notebookId: id, title: body.title },
    }, tx)
    return created!
  })
  setResponseStatus(event, 201)
  return { entry, incompleteBlocks }
})
