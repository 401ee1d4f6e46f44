import { clientListQuery } from '#shared/schemas/register'
import { listClients } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const query = await getValidatedQuery(event, validateWith(clientListQuery))
  return listClients(useDb(), user, query)
})
