import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const photo = await requirePhotoAccess(event, id)
  if (!photo.thumbKey) throw createError({ statusCode: 404, message: 'This photo was stored without a thumbnail; open it full size' })
  return sendStoredObject(event, photo.thumbKey, 'image/jpeg')
})
