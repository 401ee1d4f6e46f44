import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { checkChangesQuery } from '#shared/schemas/jobs'
import { listCheckChanges } from '../../../services/rechecks'

// The coverings a re-check changed (or, with ?change=unchanged, those it left as they were).
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const query = await getValidatedQuery(event, validateWith(checkChangesQuery))
  const job = await requireJobAccess(event, id, 'recheck')
  return listCheckChanges(useDb(), job.id, query)
})
