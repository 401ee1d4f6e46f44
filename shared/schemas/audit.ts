import { z } from 'zod'
import { idValue, listQuerySchema } from './common'

export const auditItemSchema = z.object({
  coveringId: z.number({ error: 'coveringId must be a number' }).int().positive(),
  status: z.enum(['confirmed', 'not_accessible'], { error: 'status must be confirmed or not_accessible' }),
  reason: z.string().trim().max(500, 'reason is at most 500 characters').nullish().transform(v => v || null),
}).refine(v => v.status !== 'not_accessible' || !!v.reason, { message: 'reason: say why the covering could not be reached', path: ['reason'] })

export const auditCloseSchema = z.object({
  notes: z.string().trim().max(2000, 'notes is at most 2000 characters').nullish().transform(v => v || null),
})

export const fixListQuery = listQuerySchema(['dueOn', 'priority', 'createdAt', 'clause'], 'dueOn').extend({
  siteId: idValue('siteId').optional(),
  coveringId: idValue('coveringId').optional(),
  assigneeId: idValue('assigneeId').optional(),
  status: z.enum(['open', 'closed', 'all'], { error: 'status must be open, closed or all' }).default('open'),
  overdue: z.enum(['true', 'false'], { error: 'overdue must be true or false' }).optional(),
  priority: z.coerce.number().int().min(1).max(4, 'priority is 1 to 4').optional(),
})

export const fixPatchSchema = z.object({
  assigneeId: z.number({ error: 'assigneeId must be a user id' }).int().positive().nullable().optional(),
  dueOn: z.iso.date({ error: 'dueOn is a date, YYYY-MM-DD' }).optional(),
}).refine(v => v.assigneeId !== undefined || v.dueOn !== undefined, { message: 'Send assigneeId or dueOn', path: ['assigneeId'] })
