import { fixListQuery } from '#shared/schemas/audit'
import { listFixes } from '../../services/fixes'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const query = await getValidatedQuery(event, validateWith(fixListQuery))
  return listFixes(useDb(), user, query)
})
