// Dates and measures, formatted the same on the server and in the browser (fixed locale and zone).
const dateFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })
const dateTimeFormat = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', timeZone: 'UTC', timeZoneName: 'short',
})

export function formatDate(iso: string | null | undefined, empty = '—'): string {
  if (!iso) return empty
  const d = new Date(iso)
  return Number.isNaN(d.getTime()) ? iso : dateFormat.format(d)
}

export function formatDateTime(iso: string | null | undefined, empty = '—'): string {
  if (!iso) return empty
  const d = new Date(iso)
  return Number.isNaN(d.getTime()) ? iso : dateTimeFormat.format(d)
}

/** A length in millimetres, with the unit always shown. */
export function formatMm(value: number | null | undefined, empty = '—'): string {
  return value == null ? empty : `${value.toLocaleString('en-GB')} mm`
}

/** Width × drop of a covering, e.g. "1 200 × 1 800 mm". */
export function formatSize(width: number | null, drop: number | null): string {
  if (width == null && drop == null) return '—'
  const part = (v: number | null) => (v == null ? '?' : v.toLocaleString('en-GB'))
  return `${part(width)} × ${part(drop)} mm`
}

/** A finding's measured or limit value with its unit; booleans read as yes / no. */
export function formatMeasure(value: string | null, unit: string | null): string {
  if (value == null || value === '') return 'not recorded'
  if (value === 'true') return 'yes'
  if (value === 'false') return 'no'
  return unit ? `${value} ${unit}` : value
}

export function formatBytes(bytes: number): string {
  return bytes < 1024 ? `${bytes} B` : `${(bytes / 1024).toFixed(1)} KB`
}
