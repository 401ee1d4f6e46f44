import { idParamsSchema } from '#shared/schemas/common'
import { unitPatchSchema } from '#shared/schemas/register'
import { Unit } from '../../models'
import { updateLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ['admin', 'officer', 'installer'])
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(unitPatchSchema))
  const { record } = await requireInSite(event, Unit, id)
  await uniqueOr409(() => updateLogged(record, body, user, 'unit'), 'ref', 'unit on this site')
  return record.toJSON()
})
