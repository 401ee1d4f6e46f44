import { z } from 'zod'

// Names are checked against a strict pattern, so no path can leave the mailbox folder.
const params = z.object({ name: z.string().regex(/^[\w.-]+\.eml$/, 'name is not a message file').refine(n => !n.includes('..'), 'name is not a message file') })

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, ['admin'])
  const { name } = await getValidatedRouterParams(event, validateWith(params))
  const message = await readMailboxMessage(admin.workspaceId, name)
  if (!message) throw createError({ statusCode: 404, message: 'Message not found' })
  return message
})
