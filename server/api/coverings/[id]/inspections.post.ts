import { canFit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { inspectionCreateSchema } from '#shared/schemas/inspection'
import { Covering } from '../../../models'
import { signOff } from '../../../services/signoff'

// Sign-off: an inspection is saved once and never edited; a correction is a new one. Any change the visit found
// to the covering's rule-read fields (body.covering) is written with it, in the same transaction.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(inspectionCreateSchema))
  const { record: covering, site } = await requireInSite(event, Covering, id)
  const { inspection, result, replayed } = await signOff(useDb(), user, site, covering, body)
  setResponseStatus(event, replayed ? 200 : 201)
  return { id: inspection.id, kind: inspection.kind, inspectedAt: inspection.inspectedAt, verdict: inspection.verdict, rulesVersion: inspection.rulesVersion, replayed, result: result ?? null }
})
