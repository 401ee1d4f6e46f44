import { describeRuleSets } from '../../../rules'

// The rule sets with their versions and every clause's source, for the rulebook page.
export default defineEventHandler(async (event) => {
  await requireUser(event)
  return describeRuleSets()
})
