import { eq } from 'drizzle-orm'
import { base64ToBytes, keyFingerprint } from '#shared/records'
import { KEY_RETIREMENT_REASONS, registerKeyBodySchema } from '#shared/schemas/signing'
import { people, signingKeys } from '../../database/schema'

/**
 * Registers a key pair made in the browser: the public key and the secret key sealed under the
 * signing passphrase (never the passphrase, never the open key). The account password is asked
 * again, so a stolen session cannot make itself a signing key. An active key is retired in the
 * same transaction, with the reason given ('rotated' or 'replaced: forgotten passphrase').
 * A person's first key may sign at once. Every later key waits until a records officer other
 * than its owner confirms it (keys/[id]/confirm.post.ts): the server cannot tell a true
 * rotation or a forgotten passphrase from someone else holding the session and password.
 */
export default defineEventHandler(async (event) => {
  const person = await requireRole(event, 'scientist', 'witness')
  const body = await validBody(event, registerKeyBodySchema)
  let publicKey: Uint8Array
  try {
    publicKey = base64ToBytes(body.publicKey)
    if (publicKey.length !== 32) throw new Error('length')
  }
  catch {
    validationError([{ path: 'publicKey', message: 'expected an Ed25519 public key: 32 bytes in standard padded base64' }], 'body')
  }
  const database = useDatabase()

  const throttle = throttleKey(`signing-key:${person.email}`, getRequestIP(event, { xForwardedFor: process.env.THERMOTOME_TRUST_PROXY === '1' }))
  const wait = await secondsToWait(throttle)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({ statusCode: 429, message: `Too many wrong passwords. Try again in ${wait} seconds.` })
  }
  const [account] = await database.select({ passwordHash: people.passwordHash }).from(people).where(eq(people.id, person.id))
  if (!account?.passwordHash || !(await verifyPassword(account.passwordHash, body.password))) {
    await recordFailure(throttle)
    throw createError({ statusCode: 403, message: 'Your account password is wrong; the key was not registered.', data: { issues: [{ path: 'password', message: 'wrong password' }] } })
  }
  await clearFailures(throttle)

  const fingerprint = await keyFingerprint(publicKey)
  const previous = await signingActiveKey(database, person.id)
  const [anyEarlier] = await database.select({ id: signingKeys.id }).from(signingKeys).where(eq(signingKeys.personId, person.id)).limit(1)
  const first = !anyEarlier
  if (previous && !body.replaces)
    validationError([{ path: 'replaces', message: 'you already have an active key: say whether it is rotated or replaced because the passphrase is forgotten' }], 'body')

  try {
    const key = await database.transaction(async (tx) => {
      if (previous) {
        const reason = KEY_RETIREMENT_REASONS[body.replaces!]
        const retired = await tx.update(signingKeys).set({ retiredAt: new Date(), retiredReason: reason })
          .where(eq(signingKeys.id, previous.id)).returning({ id: signingKeys.id })
        if (!retired.length)
          throw createError({ statusCode: 409, message: 'Your active key changed meanwhile. Reload and try again.' })
        await recordAudit(database, {
          action: 'signing_key_retired', actorId: person.id, actorEmail: person.email, subjectType: 'signing_key', subjectId: previous.id,
          details: { fingerprint: previous.fingerprint, reason },
        }, tx)
      }
      const [row] = await tx.insert(signingKeys).values({
        personId: person.id, publicKey: body.publicKey, fingerprint, sealedSecretKey: body.sealedSecretKey,
        confirmedAt: first ? new Date() : null,
      }).returning()
      await recordAudit(database, {
        action: 'signing_key_registered', actorId: person.id, actorEmail: person.email, subjectType: 'signing_key', subjectId: row!.id,
        details: {
          fingerprint, replaces: previous?.fingerprint ?? null, iterations: body.sealedSecretKey.iterations,
          confirmation: first ? 'first key: none needed' : 'waits for a records officer',
          ...(body.replaces ? { reason: KEY_RETIREMENT_REASONS[body.replaces] } : {}),
        },
      }, tx)
      return row!
    })
    setResponseStatus(event, 201)
    return {
      key: { id: key.id, fingerprint: key.fingerprint, publicKey: key.publicKey, createdAt: key.createdAt, retiredAt: null, retiredReason: null, confirmedAt: key.confirmedAt, pending: key.confirmedAt === null },
      retired: previous?.id ?? null,
    }
  }
  catch (error) {
    if (signingIsUniqueViolation(error))
      throw createError({ statusCode: 409, message: 'This key is already registered, or another key was registered for you at the same moment. Reload and try again.' })
    throw error
  }
})
