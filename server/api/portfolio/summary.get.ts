import { canOversee } from '#shared/access'
import { portfolioSummaryQuery } from '#shared/schemas/portfolio'
import { portfolioSummary } from '../../services/portfolio'

// Verdict totals, due and overdue re-inspections and open remedies for the portfolio.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const query = await getValidatedQuery(event, validateWith(portfolioSummaryQuery))
  if (query.siteId) await requireSiteAccess(event, query.siteId)
  if (query.clientId) await requireClientAccess(event, query.clientId)
  return portfolioSummary(useDb(), user, query)
})
