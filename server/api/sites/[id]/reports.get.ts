import { canOversee } from '#shared/access'
import { z } from 'zod'
import { idParamsSchema } from '#shared/schemas/common'
import { listDispatches } from '../../../services/report-dispatch'

const pageSchema = z.object({
  page: z.coerce.number({ error: 'page must be a number' }).int('page must be a whole number').min(1, 'page starts at 1').max(100_000).default(1),
  pageSize: z.coerce.number({ error: 'pageSize must be a number' }).int('pageSize must be a whole number').min(1).max(100, 'pageSize is at most 100').default(25),
})

// The reports e-mailed for a site: who sent which file to whom, and whether it went.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const query = await getValidatedQuery(event, validateWith(pageSchema))
  const site = await requireSiteAccess(event, id)
  const list = await listDispatches(useDb(), site.id, query)
  // A mail server's error text is for the office, not for the client's property manager.
  if (user.role === 'manager') return { ...list, items: list.items.map(d => ({ ...d, lastError: null })) }
  return list
})
