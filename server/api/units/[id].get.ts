import { idParamsSchema } from '#shared/schemas/common'
import { Unit } from '../../models'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record, site } = await requireInSite(event, Unit, id)
  return { ...record.toJSON(), siteName: site.name, jurisdiction: site.jurisdiction }
})
