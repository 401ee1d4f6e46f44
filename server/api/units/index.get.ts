import { unitListQuery } from '#shared/schemas/register'
import { listUnits } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const query = await getValidatedQuery(event, validateWith(unitListQuery))
  return listUnits(useDb(), user, query)
})
