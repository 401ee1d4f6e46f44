import { canOversee } from '#shared/access'
import { recheckListQuery } from '#shared/schemas/jobs'
import { listRechecks } from '../../services/rechecks'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const query = await getValidatedQuery(event, validateWith(recheckListQuery))
  if (query.siteId) await requireSiteAccess(event, query.siteId)
  return listRechecks(useDb(), user, query)
})
