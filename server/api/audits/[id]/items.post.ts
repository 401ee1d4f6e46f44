import { canAudit } from '#shared/access'
import { auditItemSchema } from '#shared/schemas/audit'
import { idParamsSchema } from '#shared/schemas/common'
import { auditDetail, markAuditItem } from '../../../services/audits'

// Confirm a covering unchanged, or mark it not accessible with a reason. Re-measuring goes
// through POST /api/coverings/:id/inspections with the audit's id.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { audit, site } = await requireAuditAccess(event, id)
  const body = await readValidatedBody(event, validateWith(auditItemSchema))
  const db = useDb()
  await markAuditItem(db, user, audit, site, body)
  return auditDetail(db, audit)
})
