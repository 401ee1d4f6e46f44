import { canAudit } from '#shared/access'
import { fixPatchSchema } from '#shared/schemas/audit'
import { idParamsSchema } from '#shared/schemas/common'
import { Fix } from '../../models'
import { getFix, updateFix } from '../../services/fixes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const db = useDb()
  const row = await getFix(db, user, id)
  const fix = row ? await Fix.findByPk(id) : null
  if (!fix) throw createError({ statusCode: 404, message: 'Remedy not found' })
  const body = await readValidatedBody(event, validateWith(fixPatchSchema))
  await updateFix(db, user, fix, body)
  return getFix(db, user, id)
})
