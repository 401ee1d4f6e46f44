import { jurisdictions } from './record'
import type { ControlType, Jurisdiction, MadeTo, PremisesType, ProductType } from './record'
import { ruleSets as builtInRuleSets } from './sets'
import type { Basis, Clause, ClauseKind, DateField, RuleSet, RuleSetMap, Threshold } from './types'

export interface ClauseDescription {
  id: string
  title: string
  kind: ClauseKind
  source: { document: string, section: string, url?: string }
  basis: Basis
  appliesTo: {
    description: string
    controls: ControlType[]
    innerCordProducts: boolean
    products: ProductType[] | null
    premises: PremisesType[] | null
    madeTo: MadeTo[] | null
    dates: { fields: DateField[], from: string | null, until: string | null } | null
  }
  thresholds: Threshold[]
  note?: string
}

export interface RuleSetDescription {
  jurisdiction: Jurisdiction
  name: string
  version: string
  scope: { description: string, premises: PremisesType[] }
  clauses: ClauseDescription[]
}

/** A clause as plain JSON (no evaluator), for the rulebook page and for fingerprints. */
export function describeClause(c: Clause): ClauseDescription {
  const a = c.appliesTo
  const out: ClauseDescription = {
    id: c.id,
    title: c.title,
    kind: c.kind,
    source: c.source.url === undefined ? { document: c.source.document, section: c.source.section } : { ...c.source },
    basis: c.basis,
    appliesTo: {
      description: a.description,
      controls: [...a.controls],
      innerCordProducts: a.innerCordProducts === true,
      products: a.products === undefined ? null : [...a.products],
      premises: a.premises === undefined ? null : [...a.premises],
      madeTo: a.madeTo === undefined ? null : [...a.madeTo],
      dates: a.dates === undefined ? null : { fields: [...a.dates.fields], from: a.dates.from ?? null, until: a.dates.until ?? null },
    },
    thresholds: c.thresholds.map(t => (t.note === undefined ? { name: t.name, value: t.value, unit: t.unit } : { ...t })),
  }
  if (c.note !== undefined) out.note = c.note
  return out
}

export function describeRuleSet(set: RuleSet): RuleSetDescription {
  return {
    jurisdiction: set.jurisdiction,
    name: set.name,
    version: set.version,
    scope: { description: set.scope.description, premises: [...set.scope.premises] },
    clauses: set.clauses.map(describeClause),
  }
}

/** Every rule set as plain JSON, in the order AU, CA, US, EU (for `GET /api/rules`). */
export function describeRuleSets(sets: Partial<RuleSetMap> = builtInRuleSets): RuleSetDescription[] {
  const out: RuleSetDescription[] = []
  for (const j of jurisdictions) {
    const set = sets[j]
    if (set !== undefined) out.push(describeRuleSet(set))
  }
  return out
}
