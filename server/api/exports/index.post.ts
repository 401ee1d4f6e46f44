import { canOversee } from '#shared/access'
import { exportCreateSchema } from '#shared/schemas/jobs'
import { jobJson } from '../../services/jobs'
import { createExport } from '../../services/exports'

// { scope: site | client, id }: the audit CSV built in the background, downloaded when done.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const body = await readValidatedBody(event, validateWith(exportCreateSchema))
  const target = body.scope === 'site'
    ? { scope: 'site' as const, site: await requireSiteAccess(event, body.id) }
    : { scope: 'client' as const, client: await requireClientAccess(event, body.id) }
  const job = await createExport(useDb(), user, target)
  setResponseStatus(event, 202)
  return jobJson(job)
})
