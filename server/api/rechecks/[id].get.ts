import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { recheckJson } from '../../services/rechecks'

// Status, progress and counts of changes (newly failing, newly passing, now incomplete).
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const job = await requireJobAccess(event, id, 'recheck')
  return recheckJson(useDb(), job)
})
