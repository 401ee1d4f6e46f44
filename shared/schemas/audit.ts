import { z } from 'zod'
import { idValue, listQuerySchema, multilineText, wholeNumber } from './common'

export const auditItemSchema = z.object({
  coveringId: idValue('coveringId'),
  status: z.enum(['confirmed', 'not_accessible'], { error: 'status must be confirmed or not_accessible' }),
  reason: multilineText(500, 'reason'),
}).refine(v => v.status !== 'not_accessible' || !!v.reason, { message: 'reason: say why the covering could not be reached', path: ['reason'] })

export const auditCloseSchema = z.object({
  notes: multilineText(2000, 'notes'),
})

export const fixListQuery = listQuerySchema(['dueOn', 'priority', 'createdAt', 'clause'], 'dueOn').extend({
  siteId: idValue('siteId').optional(),
  coveringId: idValue('coveringId').optional(),
  assigneeId: idValue('assigneeId').optional(),
  status: z.enum(['open', 'closed', 'all'], { error: 'status must be open, closed or all' }).default('open'),
  overdue: z.enum(['true', 'false'], { error: 'overdue must be true or false' }).optional(),
  priority: wholeNumber('priority').pipe(z.number().min(1, 'priority is 1 to 4').max(4, 'priority is 1 to 4')).optional(),
})

export const fixPatchSchema = z.object({
  assigneeId: idValue('assigneeId').nullable().optional(),
  dueOn: z.iso.date({ error: 'dueOn is a date, YYYY-MM-DD' }).optional(),
}).refine(v => v.assigneeId !== undefined || v.dueOn !== undefined, { message: 'Send assigneeId or dueOn', path: ['assigneeId'] })
