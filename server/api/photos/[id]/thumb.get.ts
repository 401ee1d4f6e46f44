import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const photo = await requirePhotoAccess(event, id)
  if (!photo.thumbKey) throw createError({ statusCode: 404, message: 'This photo has no thumbnail (HEIC); open it full size' })
  return sendStoredObject(event, photo.thumbKey, 'image/jpeg')
})
