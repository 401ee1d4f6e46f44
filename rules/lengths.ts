import { inchesToMm } from './units'

// The one reading of a typed length or force, for the fitting form and the import alike. Pure, bounded: a cell
// longer than MAX_TEXT is refused before any pattern runs, and the patterns have no nested repetition.

export type LengthUnit = 'mm' | 'in'

/** A typed figure: its value in mm (or N), or a message saying what is wrong and how to write it. */
export type Reading = { value: number, error?: undefined } | { value?: undefined, error: string }

const MAX_TEXT = 40
const factors: Record<string, number> = { mm: 1, cm: 10, m: 1000 }
// 1600 | 1600.5 | 82,5 (a decimal comma) | 82 1/2 | 82-1/2 | 3/4, then an optional unit.
const NUMBER = /^([+-]?)(?:(\d+)(?:[.,](\d+))?|(?:(\d+)[\s-]+)?(\d+)\/(\d+))\s*(mm|cm|m|in|"|n|)$/i

/**
 * Inches become millimetres to a tenth: finer than any tape read in inches, and never rounded to whole millimetres,
 * which could carry 8.01 in (203.45 mm) under the US 8 in (203.2 mm) limit (source: the US rule set, ANSI/WCMA A100.1-2018 §4.3.1).
 * Metric figures are kept as typed.
 */
export function inchesToTenthMm(inches: number): number {
  return Math.round(inchesToMm(inches) * 10) / 10
}
/** cm and m to mm without binary noise (1.1 m is 1100 mm, not 1100.0000000000002). */
const scaled = (value: number, factor: number) => Math.round(value * factor * 1e6) / 1e6

const lengthExample = (unit: LengthUnit) => unit === 'in'
  ? 'in inches such as 82.5 or 82 1/2, or with a unit such as 2100mm'
  : 'in millimetres such as 1600 or 1600mm, or with a unit such as 160cm or 63in'
const forceExample = 'in newtons such as 70 or 70N'
const quote = (raw: string) => `“${raw.length > 40 ? `${raw.slice(0, 40)}…` : raw}”`

interface Parts { value: number, unit: string, fraction: boolean }

function split(raw: string): Parts | 'thousands' | null {
  if (raw.length > MAX_TEXT) return null
  const m = NUMBER.exec(raw)
  if (!m) return /\d[,']\d/.test(raw) ? 'thousands' : null
  const sign = m[1] === '-' ? -1 : 1
  const unit = m[7]!.toLowerCase()
  if (m[2] !== undefined) {
    // A comma before exactly three digits reads as a thousands separator as readily as a decimal: refused.
    if (m[3] !== undefined && m[3].length === 3 && raw.includes(',')) return 'thousands'
    return { value: sign * Number(`${m[2]}.${m[3] ?? '0'}`), unit, fraction: false }
  }
  const denominator = Number(m[6])
  if (denominator === 0) return null
  return { value: sign * (Number(m[4] ?? 0) + Number(m[5]) / denominator), unit, fraction: true }
}

/**
 * Reads a typed length: `defaultUnit` applies to a bare number; a written unit (mm, cm, m, in or ") wins.
 * Inches may be written with fractions (82 1/2). `noun` names what the text was typed in (field, column). Returns millimetres (inches to a tenth); blank text is `null` (not recorded).
 */
export function readLength(text: string | null | undefined, defaultUnit: LengthUnit = 'mm', noun = 'field'): Reading | null {
  const raw = (text ?? '').trim()
  if (raw === '') return null
  const parts = split(raw)
  const example = lengthExample(defaultUnit)
  if (parts === 'thousands') return { error: `${quote(raw)} is not a number (leave out thousands separators and write decimals with a point); write it ${example}` }
  if (parts === null) return { error: `${quote(raw)} is not a number; write it ${example}` }
  const unit = parts.unit === '' ? defaultUnit : parts.unit === '"' ? 'in' : parts.unit
  if (unit === 'n') return { error: `${quote(raw)} is a force; this ${noun} takes a length ${example}` }
  if (unit !== 'in' && parts.fraction) return { error: `${quote(raw)} is a fraction; fractions are for inches, so write millimetres as a decimal such as 1600.5` }
  return { value: unit === 'in' ? inchesToTenthMm(parts.value) : scaled(parts.value, factors[unit]!) }
}

/** Reads a typed force in newtons (a bare number, or with N), as typed; blank text is `null` (not recorded). */
export function readForce(text: string | null | undefined, noun = 'field'): Reading | null {
  const raw = (text ?? '').trim()
  if (raw === '') return null
  const parts = split(raw)
  if (parts === 'thousands') return { error: `${quote(raw)} is not a number (leave out thousands separators and write decimals with a point); write it ${forceExample}` }
  if (parts === null || parts.fraction) return { error: `${quote(raw)} is not a number; write it ${forceExample}` }
  if (parts.unit === '' || parts.unit === 'n') return { value: parts.value }
  return { error: `${quote(raw)} is a length; this ${noun} takes a force ${forceExample}` }
}
