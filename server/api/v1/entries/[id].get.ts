import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const person = await requireApiToken(event, 'records:read')
  const { id } = await validParams(event, paramsSchema)
  const entry = await readableEntry(person, id)
  return {
    entry: {
      id: entry.id, notebookId: entry.notebookId, authorId: entry.authorId, title: entry.title, state: entry.state,
      version: entry.version, supersedesVersion: entry.supersedesVersion, content: entry.content,
      createdAt: entry.createdAt, updatedAt: entry.updatedAt,
    },
  }
})
