import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { exportFile } from '../../../services/exports'
import { getObject } from '../../../services/storage'

export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const job = await requireJobAccess(event, id, 'export')
  if (job.status !== 'succeeded') throw createError({ statusCode: 409, message: 'The export is not ready; wait for it to finish' })
  const { objectKey, fileName } = exportFile(job)
  const object = await getObject(objectKey)
  setResponseHeaders(event, {
    'Content-Type': 'text/csv; charset=utf-8',
    'Content-Disposition': `attachment; filename="${fileName.replace(/[^\w.-]/g, '_')}"`,
    ...(object.length ? { 'Content-Length': String(object.length) } : {}),
  })
  return sendStream(event, object.body)
})
