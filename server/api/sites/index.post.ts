import { canAudit } from '#shared/access'
import { siteCreateSchema } from '#shared/schemas/register'
import { Site } from '../../models'
import { createLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const body = await readValidatedBody(event, validateWith(siteCreateSchema))
  await requireClientAccess(event, body.clientId)
  const site = await uniqueOr409(() => createLogged(() => Site.create({ ...body, workspaceId: user.workspaceId }), user, 'site', { ref: body.ref }), 'ref', 'site')
  setResponseStatus(event, 201)
  return site.toJSON()
})
