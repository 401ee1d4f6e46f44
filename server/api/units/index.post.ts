import { canFit } from '#shared/access'
import { unitCreateSchema } from '#shared/schemas/register'
import { Unit } from '../../models'
import { createLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const body = await readValidatedBody(event, validateWith(unitCreateSchema))
  await requireSiteAccess(event, body.siteId)
  const unit = await uniqueOr409(() => createLogged(() => Unit.create(body), user, 'unit', { ref: body.ref, siteId: body.siteId }), 'ref', 'unit on this site')
  setResponseStatus(event, 201)
  return unit.toJSON()
})
