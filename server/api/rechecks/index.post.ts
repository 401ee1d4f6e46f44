import { canOversee } from '#shared/access'
import { recheckCreateSchema } from '#shared/schemas/jobs'
import { createRecheck, recheckJson } from '../../services/rechecks'
import { isRuleSetFixture } from '../../services/rule-fixtures'
import { clientLimit } from '../../services/scope'

// { scope: site | client | workspace, id }: re-checks every measured covering there with the current rule sets.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  const body = await readValidatedBody(event, validateWith(recheckCreateSchema))
  if (body.ruleSetFixture !== undefined && !isRuleSetFixture(body.ruleSetFixture)) {
    throw createError({ statusCode: 400, message: 'ruleSetFixture: only the test suite may substitute a rule set', data: { fields: { ruleSetFixture: 'not accepted here' } } })
  }
  if (body.scope === 'workspace' && clientLimit(user) !== undefined) throw createError({ statusCode: 403, message: 'A property manager re-checks their own sites or client' })
  const target = body.scope === 'site'
    ? { scope: 'site' as const, site: await requireSiteAccess(event, body.id!) }
    : body.scope === 'client'
      ? { scope: 'client' as const, client: await requireClientAccess(event, body.id!) }
      : { scope: 'workspace' as const }
  const job = await createRecheck(useDb(), user, target, body.ruleSetFixture ?? null)
  setResponseStatus(event, 202)
  return recheckJson(useDb(), job)
})
