import { canFit } from '#shared/access'
import { openingCreateSchema } from '#shared/schemas/register'
import { Opening, Unit } from '../../models'
import { createLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const body = await readValidatedBody(event, validateWith(openingCreateSchema))
  const { record: unit } = await requireInSite(event, Unit, body.unitId)
  const opening = await uniqueOr409(() => createLogged(() => Opening.create({ ...body, siteId: unit.siteId }), user, 'opening', { ref: body.ref, unitId: unit.id }), 'ref', 'opening in this unit')
  setResponseStatus(event, 201)
  return opening.toJSON()
})
