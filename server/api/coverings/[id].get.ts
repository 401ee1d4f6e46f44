import { idParamsSchema } from '#shared/schemas/common'
import { getCovering } from '../../services/register'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const covering = await getCovering(useDb(), user, id)
  if (!covering) throw createError({ statusCode: 404, message: 'Covering not found' })
  return covering
})
