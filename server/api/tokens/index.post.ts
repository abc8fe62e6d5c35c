import { createOwnTokenSchema } from '#shared/schemas/tokens'
import { apiTokens } from '../../database/schema'

/**
 * A person makes a token that acts for themselves: their consent to every scope it carries
 * (an administrator may give someone else's token records:read only). Shown once.
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event)
  const body = await validBody(event, createOwnTokenSchema)
  const minted = mintApiToken()
  const database = useDatabase()
  const token = await database.transaction(async (tx) => {
    const [row] = await tx.insert(apiTokens).values({
      name: body.name, tokenHash: minted.tokenHash, prefix: minted.prefix, scopes: body.scopes, createdBy: person.id, actsFor: person.id,
    }).returning()
    await recordAudit(database, {
      action: 'api_token_issued', actorId: person.id, actorEmail: person.email, subjectType: 'api_token', subjectId: row!.id,
      details: { name: body.name, scopes: body.scopes, actsFor: person.id, prefix: minted.prefix, consent: 'made by the person it acts for' },
    }, tx)
    return row!
  })
  setResponseStatus(event, 201)
  return { token: minted.token, id: token.id, name: token.name, prefix: token.prefix, scopes: token.scopes, actsFor: person.id }
})
