import { canAudit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { coveringRemovalSchema } from '#shared/schemas/removal'
import { Covering } from '../../../models'
import { removeCovering } from '../../../services/removals'

// Removing or replacing a covering: an officer's or admin's recorded act with a reason (and optionally a photo).
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record } = await requireInSite(event, Covering, id)
  const body = await readValidatedBody(event, validateWith(coveringRemovalSchema))
  const removal = await removeCovering(useDb(), user, record, body)
  setResponseStatus(event, 201)
  return removal
})
