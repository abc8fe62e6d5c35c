export default defineEventHandler(async (event) => {
  const session = await getUserSession(event)
  if (session.user) {
    await recordAudit(useDatabase(), {
      action: 'sign_out', actorId: session.user.id, actorEmail: session.user.email,
      subjectType: 'person', subjectId: session.user.id,
    })
  }
  await clearUserSession(event)
  return { signedOut: true }
})
