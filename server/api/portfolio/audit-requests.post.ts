import { canRequestAudit } from '#shared/access'
import { auditRequestSchema } from '#shared/schemas/portfolio'
import { requestAudit } from '../../services/portfolio'

// A property manager asks the workspace for an audit of some of their sites (and, optionally, units).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canRequestAudit)
  const body = await readValidatedBody(event, validateWith(auditRequestSchema))
  const sites = []
  for (const id of new Set(body.siteIds)) sites.push(await requireSiteAccess(event, id))
  const sent = await requestAudit(useDb(), user, sites, body)
  setResponseStatus(event, 201)
  return sent
})
