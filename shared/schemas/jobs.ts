import { z } from 'zod'
import { listQuerySchema } from './common'

// Request bodies and queries for background jobs: re-checks and exports (imports are in imports.ts).
const idOf = (field: string) => z.coerce.number({ error: `${field} must be a number` }).int(`${field} must be a whole number`).positive(`${field} must be positive`).max(2_147_483_647, `${field} is out of range`)

export const recheckScopes = ['site', 'client', 'workspace'] as const
export const recheckCreateSchema = z.object({
  scope: z.enum(recheckScopes, { error: 'scope must be site, client or workspace' }),
  id: idOf('id').optional(),
  /** Test mode only: a substituted rule set by name (see server/services/rule-fixtures.ts). */
  ruleSetFixture: z.string().trim().min(1).max(60, 'ruleSetFixture is at most 60 characters').optional(),
}).refine(v => v.scope === 'workspace' || v.id !== undefined, { path: ['id'], message: 'id: name the site or client to re-check' })
export type RecheckCreate = z.infer<typeof recheckCreateSchema>

const pageOnly = z.object({
  page: z.coerce.number({ error: 'page must be a number' }).int().min(1, 'page starts at 1').max(100_000).default(1),
  pageSize: z.coerce.number({ error: 'pageSize must be a number' }).int().min(1).max(100, 'pageSize is at most 100').default(25),
})
export const recheckListQuery = pageOnly.extend({ siteId: idOf('siteId').optional() })
export const checkChanges = ['newly_failing', 'newly_passing', 'now_incomplete', 'other', 'unchanged'] as const
export const checkChangesQuery = pageOnly.extend({
  change: z.enum(checkChanges, { error: `change must be one of ${checkChanges.join(', ')}` }).optional(),
})

export const exportCreateSchema = z.object({
  scope: z.enum(['site', 'client'], { error: 'scope must be site or client' }),
  id: idOf('id'),
})
export const exportListQuery = listQuerySchema(['createdAt'], '-createdAt')
