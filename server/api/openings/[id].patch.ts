import { idParamsSchema } from '#shared/schemas/common'
import { openingPatchSchema } from '#shared/schemas/register'
import { Opening } from '../../models'
import { updateLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ['admin', 'officer', 'installer'])
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(openingPatchSchema))
  const { record } = await requireInSite(event, Opening, id)
  await uniqueOr409(() => updateLogged(record, body, user, 'opening'), 'ref', 'opening in this unit')
  return record.toJSON()
})
