import { canOversee } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const client = await requireClientAccess(event, id)
  return sendAuditCsv(event, useDb(), { clientId: client.id }, `tautline-audit-${client.name}-${new Date().toISOString().slice(0, 10)}.csv`)
})
