import { idParamsSchema } from '#shared/schemas/common'
import { Covering, Photo } from '../../../models'
import { photoJson } from '../../../services/photos'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record: covering } = await requireInSite(event, Covering, id)
  const photos = await Photo.findAll({ where: { coveringId: covering.id }, order: [['createdAt', 'DESC'], ['id', 'DESC']] })
  return { items: photos.map(photoJson), total: photos.length }
})
