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
export const staffRoles = ['admin', 'officer', 'installer'] as const satisfies readonly Role[]

/** A list query: page from 1, pageSize up to 100, sort as `field` or `-field`, free-text `q`. */
export function listQuerySchema<const S extends readonly [string, ...string[]]>(sortable: S, defaultSort: S[number] | `-${S[number]}`) {
  const sortValues = [...sortable, ...sortable.map(s => `-${s}`)] as [string, ...string[]]
  return z.object({
    page: z.coerce.number({ error: 'page must be a number' }).int().min(1, 'page starts at 1').max(100_000).default(1),
    pageSize: z.coerce.number({ error: 'pageSize must be a number' }).int().min(1).max(100, 'pageSize is at most 100').default(25),
    sort: z.enum(sortValues, { error: `sort must be one of ${sortValues.join(', ')}` }).default(defaultSort),
    q: z.string().trim().max(200, 'q is at most 200 characters').optional(),
  })
}

export interface ListResult<T> { items: T[], total: number, page: number, pageSize: number }

export const optionalText = (max: number, field: string) =>
  z.string().trim().max(max, `${field} is at most ${max} characters`).nullish().transform(v => (v ? v : null))
export const requiredText = (max: number, field: string) =>
  z.string({ error: `${field} is required` }).trim().min(1, `${field} is required`).max(max, `${field} is at most ${max} characters`)
export const refText = (field: string) =>
  requiredText(60, field).regex(/^[\w.\-/ #]+$/u, `${field} may hold letters, digits, spaces and . - / # only`)

/** A PATCH body must change something: an empty or all-unknown body is a mistake worth naming. */
export function someFieldOf<T extends z.ZodObject>(schema: T) {
  const names = Object.keys(schema.shape)
  return schema.refine(v => Object.values(v as Record<string, unknown>).some(x => x !== undefined),
    { message: `nothing to change: send at least one of ${names.join(', ')}`, path: ['body'] })
}
