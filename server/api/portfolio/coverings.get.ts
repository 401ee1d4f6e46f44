import { canOversee } from '#shared/access'
import { portfolioCoveringQuery } from '#shared/schemas/portfolio'
import { portfolioCoverings } from '../../services/portfolio'

// Coverings, those needing action first (non-compliant, overdue, incomplete, never checked, due soon).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const query = await getValidatedQuery(event, validateWith(portfolioCoveringQuery))
  if (query.siteId) await requireSiteAccess(event, query.siteId)
  if (query.clientId) await requireClientAccess(event, query.clientId)
  return portfolioCoverings(useDb(), user, query)
})
