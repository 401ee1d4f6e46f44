import { canOversee } from '#shared/access'
import { importListQuery } from '#shared/schemas/imports'
import { listImports } from '../../services/imports'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const query = await getValidatedQuery(event, validateWith(importListQuery))
  return listImports(useDb(), user, query)
})
