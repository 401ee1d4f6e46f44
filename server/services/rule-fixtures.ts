import { ruleSets } from '../../rules'
import type { RuleSetMap } from '../../rules'

// Test-only: a rule-set version bump the re-check tests can ask for by name. The server accepts a
// fixture only when TAUTLINE_TEST=1 (set by `npm test`); anywhere else the request is refused.

function withThreshold(version: string, name: string, value: number): RuleSetMap {
  const au = ruleSets.AU
  const clauses = au.clauses.map(c => ({ ...c, thresholds: c.thresholds.map(t => (t.name === name ? { ...t, value } : t)) }))
  return { ...ruleSets, AU: { ...au, version, clauses } }
}

// Built once: the check engine caches compiled rule sets by object identity.
const fixtures: Record<string, () => RuleSetMap> = {
  /** AU with the hazardous loop at 200 mm instead of 220 mm: a 210 mm loop low down now fails. */
  'au-loop-200': (() => {
    let set: RuleSetMap | undefined
    return () => (set ??= withThreshold('AU-test-loop-200', 'loopMinMm', 200))
  })(),
}

export function testMode() {
  return process.env.TAUTLINE_TEST === '1'
}

export function isRuleSetFixture(name: string) {
  return testMode() && Object.hasOwn(fixtures, name)
}

export function ruleSetFixture(name: string): RuleSetMap {
  if (!isRuleSetFixture(name)) throw new Error(`rule-set fixture ${name} is not available outside test mode`)
  return fixtures[name]!()
}
