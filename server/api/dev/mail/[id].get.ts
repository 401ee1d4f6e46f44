import { idParamsSchema } from '#shared/schemas/common'
import { getSentMail } from '../../../services/mailbox'

// One message as a person reads it: recipients, subject, text and its attachments as links.
export default defineEventHandler(async (event) => {
  const admin = await requireMailboxAdmin(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const message = await getSentMail(useDb(), admin.workspaceId, id)
  if (!message) throw createError({ statusCode: 404, message: 'Message not found' })
  return message
})
