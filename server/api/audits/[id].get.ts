import { idParamsSchema } from '#shared/schemas/common'
import { auditDetail } from '../../services/audits'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { audit } = await requireAuditAccess(event, id)
  return auditDetail(useDb(), audit)
})
