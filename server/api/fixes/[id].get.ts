import { idParamsSchema } from '#shared/schemas/common'
import { getFix } from '../../services/fixes'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const fix = await getFix(useDb(), user, id)
  if (!fix) throw createError({ statusCode: 404, message: 'Remedy not found' })
  return fix
})
