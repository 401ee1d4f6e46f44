import { controlTypes, innerCorded, jurisdictions, madeToValues, premisesTypes, productTypes } from './record'
import type { ControlType, CoveringRecord } from './record'
import { missing, notApplicable } from './findings'
import { ruleSets as builtInRuleSets } from './sets'
import type { CheckOptions, CheckResult, Clause, ClauseContext, DateField, Finding, OverallVerdict, RuleSet } from './types'

// A rule set is compiled once (cached by object identity) so the hot path only reads prepared tables:
// enum values become bit positions, and every not-applicable finding is built in advance.

const KIND_REQUIREMENT = 0
const KIND_ADVICE = 1
const KIND_HISTORY = 2

interface CompiledClause {
  cx: ClauseContext
  kind: number
  controlMask: number
  /** Also applies to any product with inner lift cords, whatever the control. */
  inner: boolean
  productMask: number
  premisesMask: number
  /** -1 when the clause covers stock and custom alike. */
  madeToMask: number
  hasDates: boolean
  useInstalledOn: boolean
  useManufacturedOn: boolean
  from: string | null
  fromMonth: string
  until: string | null
  untilMonth: string
  untilIsFirstOfMonth: boolean
  dateFieldWords: string
  // Prepared not-applicable findings, one per reason.
  historyFinding: Finding
  controlFinding: Finding[]
  productFinding: Finding[]
  premisesFinding: Finding
  dateFinding: Finding
  madeToFinding: Finding[]
  scopeFinding: Finding
  madeToMessage: string
}

interface CompiledRuleSet {
  set: RuleSet
  premisesMask: number
  clauses: CompiledClause[]
}

// Maps, not plain objects: a string-keyed Map lookup stays fast whichever value comes in.
function indexOf<K extends string>(keys: readonly K[]): Map<string, number> {
  return new Map(keys.map((k, i) => [k, i]))
}

function mask(index: Map<string, number>, chosen: readonly string[] | undefined): number {
  if (chosen === undefined) return -1
  let m = 0
  for (const k of chosen) m |= 1 << index.get(k)!
  return m
}

const CONTROL_INDEX = indexOf(controlTypes)
const PRODUCT_INDEX = indexOf(productTypes)
const PREMISES_INDEX = indexOf(premisesTypes)
const MADE_TO_INDEX = indexOf(madeToValues)
const JURISDICTION_INDEX = indexOf(jurisdictions)
// Compiled built-in sets by jurisdiction index, so the common case skips the WeakMap.
const builtInCompiled: (CompiledRuleSet | undefined)[] = []
const INNER_PRODUCT_MASK = mask(PRODUCT_INDEX, innerCorded)

const compiledCache = new WeakMap<RuleSet, CompiledRuleSet>()

const CONTROL_WORDS: Record<ControlType, string> = {
  chain_loop: 'a chain loop',
  cord_loop: 'a cord loop',
  free_cord: 'a free-hanging cord',
  wand: 'a wand',
  motorised: 'a motor',
  cordless: 'no cord',
}

function formatSource(clause: Clause): string {
  return `${clause.source.document}, ${clause.source.section}`
}

function compileClause(clause: Clause, scopeMessage: string): CompiledClause {
  const t: Record<string, number> = {}
  for (const th of clause.thresholds) t[th.name] = th.value
  const cx: ClauseContext = { clause, id: clause.id, source: formatSource(clause), basis: clause.basis, t, naCache: new Map() }
  const a = clause.appliesTo
  const inner = a.innerCordProducts === true
  const from = a.dates?.from ?? null
  const until = a.dates?.until ?? null
  const dateFields: readonly DateField[] = a.dates?.fields ?? []
  return {
    cx,
    kind: clause.kind === 'requirement' ? KIND_REQUIREMENT : clause.kind === 'advice' ? KIND_ADVICE : KIND_HISTORY,
    controlMask: mask(CONTROL_INDEX, a.controls),
    inner,
    productMask: mask(PRODUCT_INDEX, a.products),
    premisesMask: mask(PREMISES_INDEX, a.premises),
    madeToMask: mask(MADE_TO_INDEX, a.madeTo),
    hasDates: a.dates !== undefined,
    useInstalledOn: dateFields.includes('installedOn'),
    useManufacturedOn: dateFields.includes('manufacturedOn'),
    from,
    fromMonth: from === null ? '' : from.slice(0, 7),
    until,
    untilMonth: until === null ? '' : until.slice(0, 7),
    untilIsFirstOfMonth: until !== null && until.slice(8) === '01',
    dateFieldWords: dateFields.join(' and '),
    historyFinding: notApplicable(cx, clause.note ?? 'Withdrawn; kept as history and decides nothing.'),
    controlFinding: controlTypes.map(c =>
      notApplicable(cx, `Does not apply to a covering worked by ${CONTROL_WORDS[c]}${inner ? ' without inner lift cords' : ''}. Applies to ${a.description}.`),
    ),
    productFinding: productTypes.map(p => notApplicable(cx, `Does not apply to a ${p} product. Applies to ${a.description}.`)),
    premisesFinding: notApplicable(cx, `Does not apply on these premises. Applies to ${a.description}.`),
    dateFinding: notApplicable(cx, `Does not apply by date. Applies to ${a.description}.`),
    madeToFinding: madeToValues.map(m => notApplicable(cx, `Does not apply to ${m} products. Applies to ${a.description}.`)),
    scopeFinding: notApplicable(cx, scopeMessage),
    madeToMessage: `Not recorded whether the product was made to stock or custom; this clause covers ${a.description}.`,
  }
}

function compileRuleSet(set: RuleSet): CompiledRuleSet {
  const scopeWords = set.scope.premises.map(p => p.replace('_', ' ')).join(', ')
  const scopeMessage = `Outside the scope of the ${set.name} rules: ${set.scope.description} Covered premises: ${scopeWords}.`
  return {
    set,
    premisesMask: mask(PREMISES_INDEX, set.scope.premises),
    clauses: set.clauses.map(clause => compileClause(clause, scopeMessage)),
  }
}

function compiled(set: RuleSet): CompiledRuleSet {
  let c = compiledCache.get(set)
  if (c === undefined) {
    c = compileRuleSet(set)
    compiledCache.set(set, c)
  }
  return c
}

/** Today's date as YYYY-MM-DD (UTC); only read when a record leaves a deciding date unrecorded. */
export function currentDateIso(): string {
  return new Date().toISOString().slice(0, 10)
}

/**
 * Is a recorded date inside [from, until)? A month-only date counts as inside when any day of that
 * month is inside (stricter: the clause applies when it might).
 */
function dateInWindow(value: string, cc: CompiledClause): boolean {
  if (value.length === 7) {
    if (cc.from !== null && value < cc.fromMonth) return false
    if (cc.until !== null && (value > cc.untilMonth || (value === cc.untilMonth && cc.untilIsFirstOfMonth))) return false
    return true
  }
  if (cc.from !== null && value < cc.from) return false
  if (cc.until !== null && value >= cc.until) return false
  return true
}

const DATE_UNRECORDED = 0
const DATE_INSIDE = 1
const DATE_OUTSIDE = 2

function dateStatus(record: CoveringRecord, cc: CompiledClause): number {
  let recorded = false
  if (cc.useInstalledOn && record.installedOn !== null) {
    if (dateInWindow(record.installedOn, cc)) return DATE_INSIDE
    recorded = true
  }
  if (cc.useManufacturedOn && record.manufacturedOn !== null) {
    if (dateInWindow(record.manufacturedOn, cc)) return DATE_INSIDE
    recorded = true
  }
  return recorded ? DATE_OUTSIDE : DATE_UNRECORDED
}

function evaluateClause(
  record: CoveringRecord,
  cc: CompiledClause,
  controlIndex: number,
  productIndex: number,
  premisesIndex: number,
  options: CheckOptions | undefined,
): Finding {
  if (cc.kind === KIND_HISTORY) return cc.historyFinding
  if ((cc.controlMask & (1 << controlIndex)) === 0 && !(cc.inner && (INNER_PRODUCT_MASK & (1 << productIndex)) !== 0)) {
    return cc.controlFinding[controlIndex]!
  }
  if ((cc.productMask & (1 << productIndex)) === 0) return cc.productFinding[productIndex]!
  if ((cc.premisesMask & (1 << premisesIndex)) === 0) return cc.premisesFinding
  const cx = cc.cx
  let dateNote: string | null = null
  if (cc.hasDates) {
    const status = dateStatus(record, cc)
    if (status === DATE_OUTSIDE) return cc.dateFinding
    if (status === DATE_UNRECORDED) {
      const today = options?.today ?? currentDateIso()
      if (!dateInWindow(today, cc)) return cc.dateFinding
      dateNote = ` (${cc.dateFieldWords} not recorded: checked as if it were ${today}.)`
    }
  }
  if (cc.madeToMask !== -1) {
    if (record.madeTo === null) {
      return missing(cx, 'madeTo', null, null, cc.madeToMessage, 'Record whether the product was made to stock (set sizes, cutting to size included) or custom.')
    }
    const m = MADE_TO_INDEX.get(record.madeTo)!
    if ((cc.madeToMask & (1 << m)) === 0) return cc.madeToFinding[m]!
  }
  let finding = cx.clause.evaluate(record, cx)
  // Advice can never pass or fail a covering, whatever its evaluator returns.
  if (cc.kind === KIND_ADVICE && finding.verdict !== 'advice' && finding.verdict !== 'not_applicable') finding = { ...finding, verdict: 'advice' }
  if (dateNote !== null && finding.verdict !== 'not_applicable') finding = { ...finding, message: finding.message + dateNote }
  return finding
}

function enumIndex(index: Map<string, number>, value: string, field: string): number {
  const i = index.get(value)
  if (i === undefined) throw new TypeError(`checkRecord: ${field} ${JSON.stringify(value)} is not a known value; validate records with coveringRecordSchema first`)
  return i
}

/** Check one validated record against its jurisdiction's rule set. Pure: reads only its arguments (and the clock if a date is unrecorded and `today` is not given). */
export function checkRecord(record: CoveringRecord, options?: CheckOptions): CheckResult {
  const j = enumIndex(JURISDICTION_INDEX, record.jurisdiction, 'jurisdiction')
  const custom = options?.ruleSets?.[record.jurisdiction]
  let c: CompiledRuleSet
  if (custom === undefined) {
    c = builtInCompiled[j] ?? (builtInCompiled[j] = compiled(builtInRuleSets[record.jurisdiction]))
  }
  else {
    c = compiled(custom)
  }
  const set = c.set
  const controlIndex = enumIndex(CONTROL_INDEX, record.control, 'control')
  const productIndex = enumIndex(PRODUCT_INDEX, record.productType, 'productType')
  const premisesIndex = enumIndex(PREMISES_INDEX, record.premises, 'premises')
  const n = c.clauses.length
  const findings: Finding[] = new Array<Finding>(n)
  let verdict: OverallVerdict = 'not_applicable'
  if ((c.premisesMask & (1 << premisesIndex)) === 0) {
    for (let i = 0; i < n; i++) findings[i] = c.clauses[i]!.scopeFinding
    return { ref: record.ref, jurisdiction: record.jurisdiction, rulesVersion: set.version, verdict, findings }
  }
  let anyFail = false
  let anyMissing = false
  let anyApplies = false
  for (let i = 0; i < n; i++) {
    const cc = c.clauses[i]!
    const f = evaluateClause(record, cc, controlIndex, productIndex, premisesIndex, options)
    findings[i] = f
    if (cc.kind !== KIND_REQUIREMENT) continue
    const v = f.verdict
    if (v === 'fail') anyFail = true
    else if (v === 'missing') anyMissing = true
    else if (v === 'pass') anyApplies = true
  }
  if (anyFail) verdict = 'non_compliant'
  else if (anyMissing) verdict = 'incomplete'
  else if (anyApplies) verdict = 'compliant'
  return { ref: record.ref, jurisdiction: record.jurisdiction, rulesVersion: set.version, verdict, findings }
}

/** Check many validated records; `today` is read once for the whole batch. */
export function checkRecords(records: readonly CoveringRecord[], options?: CheckOptions): CheckResult[] {
  const opts: CheckOptions = { ruleSets: options?.ruleSets, today: options?.today ?? currentDateIso() }
  const out = new Array<CheckResult>(records.length)
  for (let i = 0; i < records.length; i++) out[i] = checkRecord(records[i]!, opts)
  return out
}

/** The built-in rule set for a jurisdiction. */
export function getRuleSet(jurisdiction: CoveringRecord['jurisdiction']): RuleSet {
  return builtInRuleSets[jurisdiction]
}
