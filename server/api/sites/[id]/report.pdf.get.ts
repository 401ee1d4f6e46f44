import { StorageUnavailableError } from '../../../services/storage'
import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { buildSiteReport, reportPdfHeaders } from '../../../services/report'

// The landlord's report for a site, drawn fresh from the register.
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const site = await requireSiteAccess(event, id)
  try {
    const { data, pdf } = await buildSiteReport(useDb(), site.id)
    setResponseHeaders(event, reportPdfHeaders(site.ref, data.generatedOn))
    return pdf
  }
  catch (err) {
    // A report without its photos would read as if there were none: refuse rather than send it short.
    if (err instanceof StorageUnavailableError) throw createError({ statusCode: 503, message: 'Photo storage is unreachable just now, so the report cannot show its photos. Try again in a moment.' })
    throw err
  }
})
