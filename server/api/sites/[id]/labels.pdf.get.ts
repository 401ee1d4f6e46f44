import { canFit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { defaultSheetFor, labelDataForCoverings, labelPdfHeaders, labelQuerySchema, positionProblem, renderLabelsPdf } from '../../../services/labels'
import { appUrl } from '../../../services/mail'

// Installer labels for every covering in place on a site, in unit, opening and covering order.
export default defineEventHandler(async (event) => {
  await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const query = await getValidatedQuery(event, validateWith(labelQuerySchema))
  const site = await requireSiteAccess(event, id)
  const sheet = query.sheet ?? defaultSheetFor(site.jurisdiction)
  const problem = positionProblem(sheet, query.position)
  if (problem) throw createError({ statusCode: 400, message: problem, data: { fields: { position: problem } } })
  const labels = await labelDataForCoverings(useDb(), { siteId: site.id }, appUrl('/'))
  if (labels.length === 0) throw createError({ statusCode: 404, message: 'This site has no coverings in place to label' })
  const pdf = await renderLabelsPdf(labels, { sheet, startPosition: query.position, title: `Installer labels ${site.ref}` })
  setResponseHeaders(event, labelPdfHeaders(site.ref))
  return pdf
})
