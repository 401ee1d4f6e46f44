import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { jobJson } from '../../services/jobs'
import { exportFile } from '../../services/exports'

export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const job = await requireJobAccess(event, id, 'export')
  return { ...jobJson(job), fileName: exportFile(job).fileName, fileUrl: job.status === 'succeeded' ? `/api/exports/${job.id}/file` : null }
})
