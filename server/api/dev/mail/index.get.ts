import { mailboxListQuery } from '#shared/schemas/mail'
import { listSentMail } from '../../../services/mailbox'

// The admin's view of the mail their own workspace caused, while the local mail fake is in use.
export default defineEventHandler(async (event) => {
  const admin = await requireMailboxAdmin(event)
  const query = await getValidatedQuery(event, validateWith(mailboxListQuery))
  return listSentMail(useDb(), admin.workspaceId, query)
})
