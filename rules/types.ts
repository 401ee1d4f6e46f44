import type { ControlType, CoveringRecord, Jurisdiction, MadeTo, PremisesType, ProductType, RecordField } from './record'

/** How sure we are of a clause's figures: read in the regulation, seen only in trade pages, trade habit, or recalled. */
export type Basis = 'published' | 'secondary' | 'common_practice' | 'memory'
/** Requirements decide the verdict; advice and withdrawn history never do. */
export type ClauseKind = 'requirement' | 'advice' | 'history'
export type ClauseVerdict = 'pass' | 'fail' | 'missing' | 'not_applicable' | 'advice'
export type OverallVerdict = 'compliant' | 'non_compliant' | 'incomplete' | 'not_applicable'
export type Unit = 'mm' | 'in' | 'N' | '%' | 'mg/kg' | 's'
export type MeasuredValue = number | boolean | string | null
export type DateField = 'installedOn' | 'manufacturedOn'

export interface Source {
  document: string
  section: string
  url?: string
}

export interface Threshold {
  /** Name the evaluator reads, in the trade's words with the unit in it, e.g. `loopMinMm`. */
  name: string
  value: number
  unit: Unit
  note?: string
}

export interface DateWindow {
  /** The clause applies if any of these recorded dates falls in the window; if none is recorded, today is used. */
  fields: readonly DateField[]
  /** First day covered, YYYY-MM-DD. */
  from?: string
  /** First day no longer covered, YYYY-MM-DD. */
  until?: string
}

export interface AppliesTo {
  /** Plain words, shown on the rulebook page and in not-applicable messages. */
  description: string
  controls: readonly ControlType[]
  /** Also applies, whatever the control, to products with inner lift cords (roman, venetian, cellular, pleated). */
  innerCordProducts?: boolean
  products?: readonly ProductType[]
  premises?: readonly PremisesType[]
  madeTo?: readonly MadeTo[]
  dates?: DateWindow
}

/** One clause's verdict on one record. Findings are read-only: not-applicable ones are shared between results. */
export interface Finding {
  readonly clause: string
  readonly verdict: ClauseVerdict
  readonly measured: MeasuredValue
  readonly limit: MeasuredValue
  readonly unit: Unit | null
  readonly field: RecordField | null
  readonly source: string
  readonly basis: Basis
  readonly message: string
  readonly fix: string | null
}

/** What an evaluator is handed besides the record: its clause, with thresholds by name. */
export interface ClauseContext {
  readonly clause: Clause
  readonly id: string
  /** `document, section`, as printed in findings. */
  readonly source: string
  readonly basis: Basis
  readonly t: Readonly<Record<string, number>>
  /** Shared not-applicable findings of this clause, by message (filled by `notApplicable`). */
  readonly naCache: Map<string, Finding>
}

/** Decides one clause for one record. Called only when the clause's `appliesTo` matches. */
export type Evaluator = (record: CoveringRecord, cx: ClauseContext) => Finding

export interface Clause {
  id: string
  title: string
  kind: ClauseKind
  source: Source
  basis: Basis
  appliesTo: AppliesTo
  thresholds: readonly Threshold[]
  note?: string
  evaluate: Evaluator
}

export interface RuleSet {
  jurisdiction: Jurisdiction
  name: string
  /** Changes whenever a clause or threshold changes, e.g. `AU-2026.12.0`. */
  version: string
  scope: {
    description: string
    /** Premises the rule set covers; a record elsewhere is not_applicable. */
    premises: readonly PremisesType[]
  }
  clauses: readonly Clause[]
}

export type RuleSetMap = Record<Jurisdiction, RuleSet>

export interface CheckResult {
  ref: string
  jurisdiction: Jurisdiction
  rulesVersion: string
  verdict: OverallVerdict
  findings: Finding[]
}

export interface CheckOptions {
  /** Substitute rule sets; a jurisdiction left out uses the built-in set. */
  ruleSets?: Partial<RuleSetMap>
  /** YYYY-MM-DD used when a record's date is not recorded; defaults to the current date. */
  today?: string
}
