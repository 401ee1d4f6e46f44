import { canFit } from '#shared/access'
import { coveringCreateSchema } from '#shared/schemas/register'
import { Covering, Opening } from '../../models'
import { createLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const body = await readValidatedBody(event, validateWith(coveringCreateSchema))
  const { record: opening } = await requireInSite(event, Opening, body.openingId)
  const covering = await uniqueOr409(() => createLogged(() => Covering.create({ ...body, siteId: opening.siteId }), user, 'covering', { ref: body.ref, openingId: opening.id }), 'ref', 'covering on this site')
  setResponseStatus(event, 201)
  return covering.toJSON()
})
