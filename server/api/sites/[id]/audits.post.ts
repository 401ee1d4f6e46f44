import { canAudit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { auditDetail, openAudit } from '../../../services/audits'

// Opens an audit of the site, or resumes the one already open (from any device).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const site = await requireSiteAccess(event, id)
  const db = useDb()
  const { audit, resumed } = await openAudit(db, user, site)
  setResponseStatus(event, resumed ? 200 : 201)
  return { ...(await auditDetail(db, audit)), resumed }
})
