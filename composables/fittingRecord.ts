import { buildRecord, checkRecord, parseCoveringRecord } from '../rules'
import type { CheckResult, ControlType, CoveringRecordInput } from '../rules'
import type { CoveringDetail, FindingRow } from '#shared/types/register'
import type { FittingField } from './fittingFields'
import { parseForce, parseLength } from './measure'
import type { LengthUnit } from './measure'
import { fieldLabel } from './labels'

/** What the register says about a covering and its site, which the record takes as given. */
export type FittingContext = Pick<CoveringDetail, 'ref' | 'jurisdiction' | 'productType' | 'madeTo' | 'manufacturedOn' | 'installedOn' | 'childrensRoom'> & { premises: string }

export type DraftValue = string | boolean | null
export type Measurements = Record<string, number | boolean | string | null>

/** The typed values of the shown fields, in mm and N, with a message for each that cannot be read. */
export function readMeasurements(fields: FittingField[], values: Record<string, DraftValue>, units: Record<string, LengthUnit>) {
  const measurements: Measurements = {}
  const errors: Record<string, string> = {}
  for (const f of fields) {
    const raw = values[f.name] ?? null
    if (f.kind === 'flag') measurements[f.name] = typeof raw === 'boolean' ? raw : null
    else if (f.kind === 'fixing') measurements[f.name] = typeof raw === 'string' && raw ? raw : null
    else {
      const text = typeof raw === 'string' ? raw : null
      const force = f.kind === 'force' ? parseForce(text) : null
      const length = f.kind === 'length' ? parseLength(text, units[f.name] ?? 'mm') : null
      measurements[f.name] = force?.n ?? length?.mm ?? null
      const error = force?.error ?? length?.error
      if (error) errors[f.name] = `${f.label} ${error}`
    }
  }
  return { measurements, errors }
}

/** The full rulebook record, built by the rulebook's own buildRecord, as the server builds it at sign-off (register data wins). */
export function rulebookRecord(ctx: FittingContext, control: ControlType, measurements: Measurements): CoveringRecordInput {
  return buildRecord({
    ref: ctx.ref, jurisdiction: ctx.jurisdiction, premises: ctx.premises, productType: ctx.productType, control,
    madeTo: ctx.madeTo, manufacturedOn: ctx.manufacturedOn, installedOn: ctx.installedOn, childrensRoom: ctx.childrensRoom ?? null,
  }, measurements)
}

export interface LiveCheck {
  measurements: Measurements
  /** Messages by field name, each naming the field. */
  errors: Record<string, string>
  /** The verdict with any field in error left out; null when the register data itself is unreadable. */
  result: CheckResult | null
}

/** Validates with the server's schema and runs the rulebook, so the installer sees the verdict as they type. */
export function liveCheck(ctx: FittingContext, control: ControlType, fields: FittingField[], values: Record<string, DraftValue>, units: Record<string, LengthUnit>): LiveCheck {
  const { measurements, errors } = readMeasurements(fields, values, units)
  const labelOf = (name: string) => fields.find(f => f.name === name)?.label ?? fieldLabel(name)
  let input: Record<string, unknown> = rulebookRecord(ctx, control, measurements)
  for (let attempt = 0; attempt < 3; attempt++) {
    const parsed = parseCoveringRecord(input)
    if (parsed.success) return { measurements, errors, result: checkRecord(parsed.data) }
    const cleared: Record<string, null> = {}
    for (const issue of parsed.error.issues) {
      const name = String(issue.path[0] ?? '')
      errors[name] ??= `${labelOf(name)} ${issue.message}`
      if (name in measurements) cleared[name] = null
    }
    // A field in error is left out, so the rest still gets its verdict.
    if (!Object.keys(cleared).length) break
    input = { ...input, ...cleared }
  }
  return { measurements, errors, result: null }
}

/** An engine finding in the shape the API returns, so one component shows both. */
export function findingRow(f: CheckResult['findings'][number]): FindingRow {
  const text = (v: unknown) => (v === null || v === undefined ? null : String(v))
  return { clause: f.clause, verdict: f.verdict, measured: text(f.measured), limit: text(f.limit), unit: f.unit, field: f.field, source: f.source, basis: f.basis, message: f.message, fix: f.fix }
}
