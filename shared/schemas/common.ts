import { z } from 'zod'

// Route params and list queries, shared by every resource.
/** An id as a number, or as plain decimal digits in a path or query (no hex, exponents or signs). */
export function idValue(field: string) {
  return z.union([
    z.number({ error: `${field} must be a number` }),
    z.string().regex(/^\d{1,10}$/, `${field} must be a whole number`).transform(Number),
  ], { error: `${field} must be a whole number` })
    .pipe(z.number().int(`${field} must be a whole number`).positive(`${field} must be positive`).max(2_147_483_647, `${field} is out of range`))
}

export const idParamsSchema = z.object({ id: idValue('id') })

export const roles = ['admin', 'officer', 'installer', 'manager'] as const
export type Role = typeof roles[number]

/** A whole number in a query string (plain decimal digits) or a JSON body (a number); never coerced from true, '' or 1e3. */
export function wholeNumber(field: string) {
  return z.union([
    z.number({ error: `${field} must be a number` }),
    z.string().regex(/^\d{1,10}$/, `${field} must be a whole number`).transform(Number),
  ], { error: `${field} must be a whole number` }).pipe(z.number().int(`${field} must be a whole number`))
}

/** A list query: page from 1, pageSize up to 100, sort as `field` or `-field`, free-text `q`. */
export function listQuerySchema<const S extends readonly [string, ...string[]]>(sortable: S, defaultSort: S[number] | `-${S[number]}`) {
  const sortValues = [...sortable, ...sortable.map(s => `-${s}`)] as [string, ...string[]]
  return z.object({
    ...pageFields,
    sort: z.enum(sortValues, { error: `sort must be one of ${sortValues.join(', ')}` }).default(defaultSort),
    q: plainString('q').trim().max(200, 'q is at most 200 characters').optional(),
  })
}

export interface ListResult<T> { items: T[], total: number, page: number, pageSize: number }

// Free text never holds control characters: NUL and the other C0 controls (U+0000 to U+001F) and DEL (U+007F).
// They cannot be typed, are invisible on screen, break CSV and PDF output, and PostgreSQL refuses NUL outright.
// Multi-line text (notes, reasons, messages) may hold tab, line feed and carriage return; one-line text none.
// eslint-disable-next-line no-control-regex
const CONTROL_ONE_LINE = /[\u0000-\u001F\u007F]/
// eslint-disable-next-line no-control-regex
const CONTROL_MULTI_LINE = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/

/** U+0007 for the first control character in `text` (for a message a person can act on). */
function firstControl(text: string, pattern: RegExp) {
  const c = pattern.exec(text)?.[0] ?? ''
  return `U+${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`
}

/** A string of `field` with no control character (line breaks and tabs allowed when `multiLine`); checked before trimming. */
export function plainString(field: string, { multiLine = false, required = false } = {}) {
  const pattern = multiLine ? CONTROL_MULTI_LINE : CONTROL_ONE_LINE
  return z.string({ error: required ? `${field} is required` : `${field} must be text` })
    .refine(v => !pattern.test(v), { error: iss => `${field} holds a control character (${firstControl(String(iss.input), pattern)}); remove it and send plain text${multiLine ? '' : ' on one line'}` })
}

/** Optional one-line text up to `max` characters; empty becomes null. */
export const optionalText = (max: number, field: string) =>
  plainString(field).trim().max(max, `${field} is at most ${max} characters`).nullish().transform(v => (v ? v : null))
/** Required one-line text, 1 to `max` characters after trimming. */
export const requiredText = (max: number, field: string) =>
  plainString(field, { required: true }).trim().min(1, `${field} is required`).max(max, `${field} is at most ${max} characters`)
/** A reference such as a site, unit or covering ref: up to 60 letters, digits, spaces and . - / #. */
export const refText = (field: string) =>
  requiredText(60, field).regex(/^[\w.\-/ #]+$/u, `${field} may hold letters, digits, spaces and . - / # only`)
/**
 * Optional multi-line text (notes, reasons, messages) up to `max` characters: line breaks and tabs are kept,
 * every other control character is refused with a 400 naming `field`; empty becomes null.
 */
export const multilineText = (max: number, field: string) =>
  plainString(field, { multiLine: true }).trim().max(max, `${field} is at most ${max} characters`).nullish().transform(v => (v ? v : null))

/** page and pageSize of a list query. */
export const pageFields = {
  page: wholeNumber('page').pipe(z.number().min(1, 'page starts at 1').max(100_000, 'page is at most 100000')).default(1),
  pageSize: wholeNumber('pageSize').pipe(z.number().min(1, 'pageSize is at least 1').max(100, 'pageSize is at most 100')).default(25),
}

/** A PATCH body must change something: an empty or all-unknown body is a mistake worth naming. */
export function someFieldOf<T extends z.ZodObject>(schema: T) {
  const names = Object.keys(schema.shape)
  return schema.refine(v => Object.values(v as Record<string, unknown>).some(x => x !== undefined),
    { message: `nothing to change: send at least one of ${names.join(', ')}`, path: ['body'] })
}
