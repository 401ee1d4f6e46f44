import { canFit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { Covering } from '../../../models'
import { defaultSheetFor, labelDataForCoverings, labelPdfHeaders, labelQuerySchema, positionProblem, renderLabelsPdf } from '../../../services/labels'
import { appUrl } from '../../../services/mail'

// One covering's installer label, placed at `position` so a part-used sticker sheet can be printed again.
export default defineEventHandler(async (event) => {
  await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const query = await getValidatedQuery(event, validateWith(labelQuerySchema))
  const { record, site } = await requireInSite(event, Covering, id)
  const sheet = query.sheet ?? defaultSheetFor(site.jurisdiction)
  const problem = positionProblem(sheet, query.position)
  if (problem) throw createError({ statusCode: 400, message: problem, data: { fields: { position: problem } } })
  const labels = await labelDataForCoverings(useDb(), [record.id], appUrl('/'))
  const pdf = await renderLabelsPdf(labels, { sheet, startPosition: query.position, title: `Installer label ${record.ref}` })
  setResponseHeaders(event, labelPdfHeaders(record.ref))
  return pdf
})
