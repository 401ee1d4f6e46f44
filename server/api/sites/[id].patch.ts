import { idParamsSchema } from '#shared/schemas/common'
import { sitePatchSchema } from '#shared/schemas/register'
import { updateLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ['admin', 'officer'])
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(sitePatchSchema))
  const site = await requireSiteAccess(event, id)
  await uniqueOr409(() => updateLogged(site, body, user, 'site'), 'ref', 'site')
  return site.toJSON()
})
