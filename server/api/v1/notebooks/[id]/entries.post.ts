import { randomUUID } from 'node:crypto'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { v1CreateEntrySchema } from '#shared/schemas/v1'
import { EngineInputError, evaluate } from '#shared/thermo'
import { entries } from '../../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/** Create a draft entry (text and calculation blocks) on behalf of the token's person. */
export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'entries:write')
  const { id } = await validParams(event, paramsSchema)
  const body = await validBody(event, v1CreateEntrySchema)
  if (!person.roles.includes('scientist'))
    throw createError({ statusCode: 403, message: 'The person this token acts for does not hold the scientist role.' })
  await readableNotebook(person, id)
  if (!(await isMember(id, person.id)))
    throw createError({ statusCode: 403, message: 'The person this token acts for is not a member of this notebook.' })

  const content: Record<string, unknown>[] = (body.text ?? '').split(/\n\s*\n/).map(p => p.trim()).filter(Boolean)
    .map(text => ({ type: 'paragraph', content: [{ type: 'text', text }] }))
  body.blocks.forEach((block, index) => {
    try {
      evaluate({ kind: block.kind, input: block.input })
    }
    catch (error) {
      if (error instanceof EngineInputError) {
        validationError(error.issues.map(issue => ({
          path: issue.path === 'kind' ? `blocks[${index}].kind` : `blocks[${index}].input${issue.path ? `.${issue.path}` : ''}`,
          message: issue.message,
        })), 'body')
      }
      throw error
    }
    content.push({ type: 'calculationBlock', attrs: { blockId: randomUUID(), kind: block.kind, title: block.title ?? '', input: block.input, collapsed: false } })
  })
  if (!content.length)
    content.push({ type: 'paragraph' })

  const database = useDatabase()
  const entry = await database.transaction(async (tx) => {
    const [created] = await tx.insert(entries).values({ notebookId: id, authorId: person.id, title: body.title, content: { type: 'doc', content } }).returning()
    await recordAudit(database, {
      action: 'entry_created', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: created!.id,
      details: { notebookId: id, title: body.title, via: 'api', tokenId: person.tokenId },
    }, tx)
    return created!
  })
  setResponseStatus(event, 201)
  return { entry: { id: entry.id, notebookId: id, title: entry.title, state: 'draft', version: entry.version, content: entry.content } }
})
