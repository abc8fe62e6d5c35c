import { and, eq, sql } from 'drizzle-orm'
import { z } from 'zod'
import { updateEntrySchema } from '#shared/schemas/entries'
import { uuidSchema } from '#shared/schemas/notebooks'
import { entries } from '../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const body = await validBody(event, updateEntrySchema)
  const entry = await readableEntry(person, id)
  lifecycleRequireEditor(person, entry)
  // The deep check evaluates every block with the engine: only for the author's own draft.
  const incompleteBlocks = body.content !== undefined ? assertEditorDocumentValid(body.content) : []

  const database = useDatabase()
  const updated = await database.transaction(async (tx) => {
    const [row] = await tx.update(entries).set({
      ...(body.title !== undefined ? { title: body.title } : {}),
      ...(body.content !== undefined ? { content: body.content } : {}),
      lockVersion: sql`${entries.lockVersion} + 1`,
      updatedAt: new Date(),
    }).where(and(eq(entries.id, id), eq(entries.lockVersion, body.lockVersion), eq(entryStateSql(), 'draft'))).returning()
    if (!row)
      return undefined
    // Autosaves are counted in the editing session; the session is audited once, when it closes.
    await noteEntrySave(tx, {
      entryId: id, personId: person.id, personEmail: person.email, version: row.version, lockVersion: row.lockVersion,
      contentHash: entryContentHash(row.title, row.content), titleChanged: body.title !== undefined && body.title !== entry.title,
    })
    return row
  })
  if (!updated) {
    throw createError({
      statusCode: 409,
      message: 'Someone else changed this entry since you opened it. Reload to see their version.',
      data: { currentLockVersion: entry.lockVersion },
    })
  }
  return { entry: updated, incompleteBlocks }
})
