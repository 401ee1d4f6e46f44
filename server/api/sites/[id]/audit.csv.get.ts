import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const site = await requireSiteAccess(event, id)
  return sendAuditCsv(event, useDb(), { siteId: site.id }, `tautline-audit-${site.ref}-${new Date().toISOString().slice(0, 10)}.csv`)
})
