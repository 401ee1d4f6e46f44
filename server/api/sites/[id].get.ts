import { idParamsSchema } from '#shared/schemas/common'
import { getSite } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  await requireSiteAccess(event, id)
  return getSite(useDb(), user, id)
})
