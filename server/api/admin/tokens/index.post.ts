import { SCOPES_WITHOUT_CONSENT, createTokenSchema } from '#shared/schemas/tokens'
import { apiTokens } from '../../../database/schema'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const body = await validBody(event, createTokenSchema)
  const person = await findPerson(body.actsFor)
  if (!person)
    validationError([{ path: 'actsFor', message: 'no such person' }], 'body')
  const needConsent = body.scopes.filter(scope => !SCOPES_WITHOUT_CONSENT.includes(scope))
  if (person.id !== admin.id && needConsent.length) {
    throw createError({
      statusCode: 403,
      message: `scopes: ${needConsent.join(', ')} act in ${person.name}'s name and need their consent: they make such a token themselves under "My API tokens". For someone else you may issue ${SCOPES_WITHOUT_CONSENT.join(', ')} only.`,
      data: { issues: [{ path: 'scopes', message: `${needConsent.join(', ')} need the consent of the person the token acts for` }] },
    })
  }
  const minted = mintApiToken()
  const database = useDatabase()
  const token = await database.transaction(async (tx) => {
    const [row] = await tx.insert(apiTokens).values({
      name: body.name, tokenHash: minted.tokenHash, prefix: minted.prefix, scopes: body.scopes, createdBy: admin.id, actsFor: body.actsFor,
    }).returning()
    await recordAudit(database, {
      action: 'api_token_issued', actorId: admin.id, actorEmail: admin.email, subjectType: 'api_token', subjectId: row!.id,
      details: { name: body.name, scopes: body.scopes, actsFor: body.actsFor, prefix: minted.prefix },
    }, tx)
    return row!
  })
  setResponseStatus(event, 201)
  // The only time the token itself is shown.
  return { token: minted.token, id: token.id, name: token.name, prefix: token.prefix, scopes: token.scopes, actsFor: body.actsFor }
})
