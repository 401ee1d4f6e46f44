import { openingListQuery } from '#shared/schemas/register'
import { listOpenings } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const query = await getValidatedQuery(event, validateWith(openingListQuery))
  return listOpenings(useDb(), user, query)
})
