import { z } from 'zod'
import { roles, someFieldOf } from './common'

export const emailSchema = z.string({ error: 'email is required' }).trim().toLowerCase()
  .max(254, 'email is too long').pipe(z.email({ error: 'email is not a valid address' }))

/** Password rule: 10 to 200 characters, not one repeated character, not the e-mail itself. */
export const passwordSchema = z.string({ error: 'password is required' })
  .min(10, 'password must be at least 10 characters')
  .max(200, 'password is at most 200 characters')
  .refine(p => new Set(p).size >= 4, 'password needs at least 4 different characters')

export const loginSchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'password is required' }).min(1, 'password is required').max(200, 'password is at most 200 characters'),
})

export const inviteSchema = z.object({
  email: emailSchema,
  name: z.string({ error: 'name is required' }).trim().min(1, 'name is required').max(120),
  role: z.enum(roles, { error: `role must be one of ${roles.join(', ')}` }),
  clientId: z.number().int().positive().nullish(),
}).refine(v => (v.role === 'manager') === (v.clientId != null), {
  message: 'clientId is required for a property manager and only for one', path: ['clientId'],
})

export const resetRequestSchema = z.object({ email: emailSchema })

export const tokenPasswordSchema = z.object({
  token: z.string({ error: 'token is required' }).regex(/^[\w-]{20,100}$/, 'token is not valid'),
  password: passwordSchema,
  name: z.string().trim().min(1).max(120).optional(),
})

export const userPatchSchema = someFieldOf(z.object({
  role: z.enum(roles).optional(),
  active: z.boolean().optional(),
  name: z.string().trim().min(1).max(120).optional(),
  clientId: z.number().int().positive().nullish(),
}))
