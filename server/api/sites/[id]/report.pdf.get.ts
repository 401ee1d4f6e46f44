import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { buildSiteReport, reportPdfHeaders } from '../../../services/report'

// The landlord's report for a site, drawn fresh from the register.
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const site = await requireSiteAccess(event, id)
  // A report without its photos would read as if there were none: storage being unreachable refuses it (503).
  const { data, pdf } = await buildSiteReport(useDb(), site.id)
  setResponseHeaders(event, reportPdfHeaders(site.ref, data.generatedOn))
  return pdf
})
