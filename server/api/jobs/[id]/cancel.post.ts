import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { jobJson, requestCancel } from '../../../services/jobs'

// Cancel an import, re-check or export: it rolls back at its next batch and writes nothing.
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const job = await requireJobAccess(event, id)
  if (!['queued', 'running'].includes(job.status)) throw createError({ statusCode: 409, message: `This job has already ${job.status === 'succeeded' ? 'finished' : job.status === 'failed' ? 'failed' : 'been cancelled'}` })
  await requestCancel(useDb(), job)
  return jobJson(job)
})
