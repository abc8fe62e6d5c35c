/**
 * The published key list: every registered signing key (owner, lifetime, who confirmed a
 * replacement) signed with the records key, for checking records offline
 * (`npm run verify -- FILE --keys thermotome-key-list.json`; format in docs/trust-anchors.md).
 */
export default defineEventHandler(async (event) => {
  await requirePerson(event)
  const list = await signedKeyList(useDatabase())
  if (!list)
    throw createError({ statusCode: 503, message: 'No records key is configured (THERMOTOME_RECORDS_KEY_FILE or records-key.pem in the data folder), so the key list cannot be signed.' })
  setResponseHeader(event, 'Content-Disposition', 'attachment; filename="thermotome-key-list.json"')
  return list
})
