import { canAudit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { MAX_ATTEMPTS, emailSiteReport, reportEmailSchema } from '../../../../services/report-dispatch'

// E-mails the site's report to the client's report contact (or to `to`); 201 when sent, 202 when queued for retry.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const site = await requireSiteAccess(event, id)
  const body = await readValidatedBody(event, validateWith(reportEmailSchema))
  const { outcome, dispatch } = await emailSiteReport(useDb(), { actor: user, siteId: site.id, to: body.to })
  if (outcome === 'sent') {
    setResponseStatus(event, 201)
    return { message: `The report was sent to ${dispatch.to}.`, dispatch }
  }
  setResponseStatus(event, 202)
  return { message: `The mail server did not take the report just now; it is queued and will be retried automatically (attempt ${dispatch.attempts} of ${MAX_ATTEMPTS}).`, dispatch }
})
