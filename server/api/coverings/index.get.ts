import { coveringListQuery } from '#shared/schemas/register'
import { listCoverings } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const query = await getValidatedQuery(event, validateWith(coveringListQuery))
  return listCoverings(useDb(), user, query)
})
