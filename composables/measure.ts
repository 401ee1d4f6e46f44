import { readForce, readLength } from '../rules'
import type { LengthUnit } from '../rules'

export type { LengthUnit }

// The form reads lengths and forces with the rulebook's one parser (rules/lengths.ts), as the import does.

/** What a typed length means: millimetres to send (null when blank) or a message naming what is wrong. */
export interface ParsedLength { mm: number | null, error: string | null }

export function parseLength(text: string | null | undefined, unit: LengthUnit): ParsedLength {
  const r = readLength(text, unit)
  return r === null ? { mm: null, error: null } : r.error !== undefined ? { mm: null, error: r.error } : { mm: r.value, error: null }
}

export function parseForce(text: string | null | undefined): { n: number | null, error: string | null } {
  const r = readForce(text)
  return r === null ? { n: null, error: null } : r.error !== undefined ? { n: null, error: r.error } : { n: r.value, error: null }
}

/** A millimetre figure for people: whole numbers plain, converted ones to a tenth. */
export function showMm(mm: number): string {
  return `${mm.toLocaleString('en-GB', { maximumFractionDigits: 1 })} mm`
}
