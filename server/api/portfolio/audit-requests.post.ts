import { canRequestAudit } from '#shared/access'
import { auditRequestSchema } from '#shared/schemas/portfolio'
import { AuditRequestRefused, requestAudit } from '../../services/portfolio'

// A property manager asks the workspace for an audit of some of their sites (and, optionally, units).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canRequestAudit)
  const body = await readValidatedBody(event, validateWith(auditRequestSchema))
  const sites = []
  for (const id of new Set(body.siteIds)) sites.push(await requireSiteAccess(event, id))
  try {
    const sent = await requestAudit(useDb(), user, sites, body)
    setResponseStatus(event, 201)
    return sent
  }
  catch (err) {
    if (err instanceof AuditRequestRefused) refusal(err)
    throw createError({ statusCode: 503, message: 'The request could not be e-mailed just now; nothing was sent. Try again in a moment.' })
  }
})
