import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { importErrorsQuery } from '#shared/schemas/imports'
import { listImportErrors } from '../../../services/imports'

// The problems kept for an import (the first 1,000), a page at a time, by row.
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const query = await getValidatedQuery(event, validateWith(importErrorsQuery))
  const { job } = await requireImportAccess(event, id)
  return listImportErrors(useDb(), job.id, query)
})
