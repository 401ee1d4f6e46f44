import { mailAttachmentQuery } from '#shared/schemas/mail'
import { idParamsSchema } from '#shared/schemas/common'
import { sentMailAttachment } from '../../../../services/mailbox'
import { getObject } from '../../../../services/storage'

// An attachment of one of this workspace's messages (a report PDF), read back from where it is stored.
export default defineEventHandler(async (event) => {
  const admin = await requireMailboxAdmin(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { index } = await getValidatedQuery(event, validateWith(mailAttachmentQuery))
  const attachment = await sentMailAttachment(useDb(), admin.workspaceId, id, index)
  if (!attachment) throw createError({ statusCode: 404, message: 'Attachment not found' })
  const object = await getObject(attachment.objectKey)
  setResponseHeaders(event, {
    'Content-Type': attachment.contentType === 'application/pdf' ? 'application/pdf' : 'application/octet-stream',
    'Content-Disposition': `attachment; filename="${attachment.fileName.replace(/[^\w.-]/g, '_')}"`,
    ...(object.length ? { 'Content-Length': String(object.length) } : {}),
  })
  return sendStream(event, object.body)
})
