import { siteListQuery } from '#shared/schemas/register'
import { listSites } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const query = await getValidatedQuery(event, validateWith(siteListQuery))
  return listSites(useDb(), user, query)
})
