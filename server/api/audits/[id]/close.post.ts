import { canAudit } from '#shared/access'
import { auditCloseSchema } from '#shared/schemas/audit'
import { idParamsSchema } from '#shared/schemas/common'
import { auditDetail, closeAudit } from '../../../services/audits'

// Closing signs the audit with the officer's name and the date; every covering must be accounted for.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { audit } = await requireAuditAccess(event, id)
  const body = await readValidatedBody(event, validateWith(auditCloseSchema))
  const db = useDb()
  await closeAudit(db, user, audit, body.notes)
  return auditDetail(db, audit)
})
