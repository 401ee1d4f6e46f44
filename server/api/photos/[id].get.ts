import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const photo = await requirePhotoAccess(event, id)
  return sendStoredObject(event, photo.objectKey, photo.contentType)
})
