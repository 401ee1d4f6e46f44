import { inchesToMm } from '~/rules'

export type LengthUnit = 'mm' | 'in'

/** What a typed length means: millimetres to send (null when blank) or a message naming what is wrong. */
export interface ParsedLength { mm: number | null, error: string | null }

const DECIMAL = /^-?\d+(?:[.,]\d+)?$/
// Tape measures in inches read in fractions: "82 1/2", "82-1/2" or "3/4".
const FRACTION = /^(?:(\d+)[\s-]+)?(\d+)\/(\d+)$/

function readNumber(text: string, allowFraction: boolean): number | null {
  const t = text.trim()
  if (DECIMAL.test(t)) return Number(t.replace(',', '.'))
  const f = allowFraction ? FRACTION.exec(t) : null
  if (!f || Number(f[3]) === 0) return null
  return Number(f[1] ?? 0) + Number(f[2]) / Number(f[3])
}

/** Inches become millimetres to a tenth, finer than any tape read in inches. */
export function toMm(value: number, unit: LengthUnit): number {
  return unit === 'in' ? Math.round(inchesToMm(value) * 10) / 10 : value
}

export function parseLength(text: string | null | undefined, unit: LengthUnit): ParsedLength {
  if (text == null || text.trim() === '') return { mm: null, error: null }
  const n = readNumber(text, unit === 'in')
  if (n === null || !Number.isFinite(n)) {
    return { mm: null, error: unit === 'in' ? 'must be a number of inches, such as 82.5 or 82 1/2' : 'must be a number of millimetres, such as 2100' }
  }
  return { mm: toMm(n, unit), error: null }
}

export function parseForce(text: string | null | undefined): { n: number | null, error: string | null } {
  if (text == null || text.trim() === '') return { n: null, error: null }
  const n = readNumber(text, false)
  return n === null ? { n: null, error: 'must be a force in newtons, such as 70' } : { n, error: null }
}

/** A millimetre figure for people: whole numbers plain, converted ones to a tenth. */
export function showMm(mm: number): string {
  return `${mm.toLocaleString('en-GB', { maximumFractionDigits: 1 })} mm`
}
