import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { mayDo } from '#shared/records/lifecycle'
import { uuidSchema } from '#shared/schemas/notebooks'
import { notebooks, people } from '../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const { id } = await validParams(event, paramsSchema)
  const entry = await readableEntry(person, id)
  const database = useDatabase()
  const [[author], [notebook]] = await Promise.all([
    database.select({ id: people.id, name: people.name, email: people.email }).from(people).where(eq(people.id, entry.authorId)),
    database.select({ id: notebooks.id, name: notebooks.name }).from(notebooks).where(eq(notebooks.id, entry.notebookId)),
  ])
  return {
    entry,
    author,
    notebook,
    canEdit: mayDo('edit', person, { authorId: entry.authorId, state: entry.state, personIsMember: true, personAskedToWitness: false }).allowed,
  }
})
