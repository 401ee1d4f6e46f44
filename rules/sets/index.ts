import type { RuleSetMap } from '../types'
import { auRuleSet } from './au'
import { caRuleSet } from './ca'
import { euRuleSet } from './eu'
import { usRuleSet } from './us'

/** The built-in rule sets, one per jurisdiction. */
export const ruleSets: RuleSetMap = {
  AU: auRuleSet,
  CA: caRuleSet,
  US: usRuleSet,
  EU: euRuleSet,
}

export { auRuleSet, caRuleSet, euRuleSet, usRuleSet }
