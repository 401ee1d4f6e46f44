// Admin-only view of the local mail fake, for development and demos.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, ['admin'])
  const items = await listMailbox(admin.workspaceId)
  return { items, total: items.length }
})
