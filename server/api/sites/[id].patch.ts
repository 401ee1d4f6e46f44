import { canAudit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { sitePatchSchema } from '#shared/schemas/register'
import { updateLogged } from '../../services/records'

// Tenant first, then the body: another tenant's record is 404 whatever was sent.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const site = await requireSiteAccess(event, id)
  const body = await readValidatedBody(event, validateWith(sitePatchSchema))
  await uniqueOr409(() => updateLogged(site, body, user, 'site'), 'ref', 'site')
  return site.toJSON()
})
