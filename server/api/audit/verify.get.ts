export default defineEventHandler(async (event) => {
  await requireRole(event, 'compliance', 'admin')
  return await verifyAuditChain(useDatabase())
})
