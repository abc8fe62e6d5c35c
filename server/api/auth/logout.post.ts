/**
 * Sign out, everywhere: the person's session epoch moves on, so every cookie of theirs (this
 * one, another browser's, one copied before sign-out) is refused from now on. A cookie that is
 * already stale ends nothing (it signs out only itself).
 */
export default defineEventHandler(async (event) => {
  const person = await requirePerson(event).catch(() => undefined)
  if (person) {
    const database = useDatabase()
    await database.transaction(async (tx) => {
      await endAllSessions(tx, person.id)
      await recordAudit(database, {
        action: 'sign_out', actorId: person.id, actorEmail: person.email,
        subjectType: 'person', subjectId: person.id, details: { sessionsEnded: 'all' },
      }, tx)
    })
  }
  await clearUserSession(event)
  return { signedOut: true }
})
