import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const client = await requireClientAccess(event, id)
  return client.toJSON()
})
