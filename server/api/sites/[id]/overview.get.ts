import { idParamsSchema } from '#shared/schemas/common'
import { siteOverview } from '../../../services/overview'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  await requireSiteAccess(event, id)
  return siteOverview(useDb(), id)
})
