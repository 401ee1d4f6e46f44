import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { getImport } from '../../services/imports'

// Status, progress, counts and the first row problems of one import.
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { job } = await requireImportAccess(event, id)
  return getImport(useDb(), job)
})
