import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { importCommitSchema } from '#shared/schemas/imports'
import { commitDryRun, getImport } from '../../../services/imports'

// Commits the file a finished dry run checked; `skipInvalid` must be chosen to leave bad rows out.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(importCommitSchema))
  const dryRun = await requireImportAccess(event, id)
  const job = await commitDryRun(useDb(), user, dryRun, body.skipInvalid)
  setResponseStatus(event, 202)
  return getImport(useDb(), job)
})
