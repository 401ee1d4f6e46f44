import type { RecordField } from './record'
import type { ClauseContext, Finding, MeasuredValue, Unit } from './types'

// Every finding is built by one of these so all findings share one object shape (fast property access).

export function pass(
  cx: ClauseContext,
  field: RecordField | null,
  measured: MeasuredValue,
  limit: MeasuredValue,
  unit: Unit | null,
  message: string,
): Finding {
  return { clause: cx.id, verdict: 'pass', measured, limit, unit, field, source: cx.source, basis: cx.basis, message, fix: null }
}

export function fail(
  cx: ClauseContext,
  field: RecordField | null,
  measured: MeasuredValue,
  limit: MeasuredValue,
  unit: Unit | null,
  message: string,
  fix: string,
): Finding {
  return { clause: cx.id, verdict: 'fail', measured, limit, unit, field, source: cx.source, basis: cx.basis, message, fix }
}

/** The clause applies but `field` was not recorded; `fix` says how to measure it. */
export function missing(
  cx: ClauseContext,
  field: RecordField,
  limit: MeasuredValue,
  unit: Unit | null,
  message: string,
  fix: string,
): Finding {
  return { clause: cx.id, verdict: 'missing', measured: null, limit, unit, field, source: cx.source, basis: cx.basis, message, fix }
}

const NA_CACHE_LIMIT = 256 // a clause has a handful of not-applicable messages; more means a message carries record data

/**
 * A not-applicable finding. The same frozen object is returned for the same clause and message, so most
 * findings cost no allocation; `message` must therefore not carry values from the record.
 */
export function notApplicable(cx: ClauseContext, message: string): Finding {
  const cached = cx.naCache.get(message)
  if (cached !== undefined) return cached
  const finding: Finding = Object.freeze({
    clause: cx.id,
    verdict: 'not_applicable',
    measured: null,
    limit: null,
    unit: null,
    field: null,
    source: cx.source,
    basis: cx.basis,
    message,
    fix: null,
  })
  if (cx.naCache.size < NA_CACHE_LIMIT) cx.naCache.set(message, finding)
  return finding
}

export function advise(
  cx: ClauseContext,
  field: RecordField | null,
  measured: MeasuredValue,
  message: string,
  fix: string | null,
): Finding {
  return { clause: cx.id, verdict: 'advice', measured, limit: null, unit: null, field, source: cx.source, basis: cx.basis, message, fix }
}

/** A yes/no requirement: true passes, false fails, null is missing. */
export function requireFlag(
  cx: ClauseContext,
  field: RecordField,
  value: boolean | null,
  passMessage: string,
  failMessage: string,
  fix: string,
  missingMessage: string,
  missingFix: string,
): Finding {
  if (value === true) return pass(cx, field, true, true, null, passMessage)
  if (value === false) return fail(cx, field, false, true, null, failMessage, fix)
  return missing(cx, field, true, null, missingMessage, missingFix)
}

/** The longer of two recorded lengths; null only when neither was recorded (the longest cord decides). */
export function longestOf(a: number | null, b: number | null): number | null {
  if (a === null) return b
  if (b === null) return a
  return a >= b ? a : b
}

/**
 * Largest loop perimeter a record shows: the recorded perimeter, or twice a recorded pull-out when that is larger
 * (a loop pulled out L mm flat is at least 2L mm round), so a measured figure is never made smaller.
 */
export function loopPerimeter(pullOutMm: number | null, perimeterMm: number | null): number | null {
  if (pullOutMm === null) return perimeterMm
  const fromPullOut = pullOutMm * 2
  return perimeterMm === null || fromPullOut > perimeterMm ? fromPullOut : perimeterMm
}
