import { canOversee } from '#shared/access'
import { portfolioUnitQuery } from '#shared/schemas/portfolio'
import { portfolioUnits } from '../../services/portfolio'

// Units with their coverings counted by verdict and their next re-inspection date; filters site, verdict, due.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const query = await getValidatedQuery(event, validateWith(portfolioUnitQuery))
  if (query.siteId) await requireSiteAccess(event, query.siteId)
  if (query.clientId) await requireClientAccess(event, query.clientId)
  return portfolioUnits(useDb(), user, query)
})
