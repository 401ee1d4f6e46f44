import { z } from 'zod'
import { listQuerySchema, wholeNumber } from './common'

// The Mailbox's queries: the list of mail this workspace caused, and one attachment of a message.
export const mailboxListQuery = listQuerySchema(['createdAt'], '-createdAt')
export const mailAttachmentQuery = z.object({
  index: wholeNumber('index').pipe(z.number().min(0, 'index starts at 0').max(20, 'index is at most 20')).default(0),
})
