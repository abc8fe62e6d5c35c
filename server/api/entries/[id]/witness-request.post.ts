import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { uuidSchema } from '#shared/schemas/notebooks'
import { witnessRequestBodySchema } from '#shared/schemas/signing'
import { witnessRequests } from '../../../database/schema'

const paramsSchema = z.object({ id: uuidSchema })

/**
 * The author asks a witness to countersign the signed version: someone with the witness role
 * who belongs to the notebook and is not the author. The request is stored and audited in one
 * transaction; the e-mail goes out after it commits, and a failed send is audited, not fatal.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist')
  const { id } = await validParams(event, paramsSchema)
  const { witnessId } = await validBody(event, witnessRequestBodySchema)
  const entry = await readableEntry(person, id)
  if (entry.authorId !== person.id)
    throw createError({ statusCode: 403, message: 'Only the author asks for a witness.' })
  if (witnessId === person.id)
    throw createError({ statusCode: 403, message: 'Nobody witnesses their own entry: choose someone else.' })
  if (entry.state !== 'awaiting_witness')
    throw createError({ statusCode: 409, message: 'Only a signed version waiting for its witness can be sent to a witness.' })
  const witness = await findPerson(witnessId)
  if (!witness || witness.disabled)
    validationError([{ path: 'witnessId', message: 'no such person' }], 'body')
  if (!witness.roles.includes('witness'))
    validationError([{ path: 'witnessId', message: `${witness.name} does not hold the witness role` }], 'body')
  if (!(await isMember(entry.notebookId, witness.id)))
    validationError([{ path: 'witnessId', message: `${witness.name} does not belong to this notebook` }], 'body')

  const database = useDatabase()
  const request = await database.transaction(async (tx) => {
    const current = await signingLockEntry(tx, entry.id)
    if (current.state !== 'awaiting_witness' || current.version !== entry.version)
      throw createError({ statusCode: 409, message: 'This entry changed meanwhile. Reload it.' })
    const [open] = await tx.select({ id: witnessRequests.id }).from(witnessRequests).where(and(
      eq(witnessRequests.entryId, entry.id), eq(witnessRequests.version, entry.version),
      eq(witnessRequests.witnessId, witness.id), isNull(witnessRequests.resolvedAt),
    )).limit(1)
    if (open)
      throw createError({ statusCode: 409, message: `${witness.name} has already been asked to witness this version.` })
    const [row] = await tx.insert(witnessRequests).values({
      entryId: entry.id, version: entry.version, requestedBy: person.id, witnessId: witness.id,
    }).returning()
    await recordAudit(database, {
      action: 'witness_requested', actorId: person.id, actorEmail: person.email, subjectType: 'entry', subjectId: entry.id,
      details: { version: entry.version, witnessId: witness.id, witnessEmail: witness.email, requestId: row!.id },
    }, tx)
    return row!
  })

  const link = mailLink(`/entries/${entry.id}`)
  const mailed = await mailSendAudited({
    to: witness.email,
    subject: `Witness request: ${entry.title}`,
    text: [
      `${witness.name},`,
      '',
      `${person.name} has signed version ${entry.version} of "${entry.title}" and asks you to witness it.`,
      'Read it, check that its calculation blocks recompute, then countersign it or decline with a reason:',
      '',
      link,
      '',
      'Thermotome',
    ].join('\n'),
  }, { actor: person, entryId: entry.id, purpose: 'witness_request' })

  setResponseStatus(event, 201)
  return {
    request: { id: request.id, version: request.version, requestedAt: request.requestedAt, witness: { id: witness.id, name: witness.name, email: witness.email } },
    mailed,
  }
})
