import { z } from 'zod'
import { idValue, plainString, requiredText, roles, someFieldOf } from './common'

export const emailSchema = plainString('email', { required: true }).trim().toLowerCase()
  .max(254, 'email is too long').pipe(z.email({ error: 'email is not a valid address' }))

/** Password rule: 10 to 200 characters, not one repeated character, not the e-mail itself. */
export const passwordSchema = plainString('password', { required: true })
  .min(10, 'password must be at least 10 characters')
  .max(200, 'password is at most 200 characters')
  .refine(p => new Set(p).size >= 4, 'password needs at least 4 different characters')

export const loginSchema = z.object({
  email: emailSchema,
  password: plainString('password', { required: true }).min(1, 'password is required').max(200, 'password is at most 200 characters'),
})

export const inviteSchema = z.object({
  email: emailSchema,
  name: requiredText(120, 'name'),
  role: z.enum(roles, { error: `role must be one of ${roles.join(', ')}` }),
  clientId: idValue('clientId').nullish(),
}).refine(v => (v.role === 'manager') === (v.clientId != null), {
  message: 'clientId is required for a property manager and only for one', path: ['clientId'],
})

export const resetRequestSchema = z.object({ email: emailSchema })

export const tokenPasswordSchema = z.object({
  token: z.string({ error: 'token is required' }).regex(/^[\w-]{20,100}$/, 'token is not valid'),
  password: passwordSchema,
  name: requiredText(120, 'name').optional(),
})

export const userPatchSchema = someFieldOf(z.object({
  role: z.enum(roles, { error: `role must be one of ${roles.join(', ')}` }).optional(),
  active: z.boolean({ error: 'active must be true or false' }).optional(),
  name: requiredText(120, 'name').optional(),
  clientId: idValue('clientId').nullish(),
}))
