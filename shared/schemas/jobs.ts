import { z } from 'zod'
import { idValue, listQuerySchema, pageFields, requiredText } from './common'

// Request bodies and queries for background jobs: re-checks and exports (imports are in imports.ts).
// Ids are whole numbers (or their digits in a query string), never coerced from true or ''.
const idOf = idValue

export const recheckScopes = ['site', 'client', 'workspace'] as const
export const recheckCreateSchema = z.object({
  scope: z.enum(recheckScopes, { error: 'scope must be site, client or workspace' }),
  id: idOf('id').optional(),
  /** Test mode only: a substituted rule set by name (see server/services/rule-fixtures.ts). */
  ruleSetFixture: requiredText(60, 'ruleSetFixture').optional(),
}).refine(v => v.scope === 'workspace' || v.id !== undefined, { path: ['id'], message: 'id: name the site or client to re-check' })
export type RecheckCreate = z.infer<typeof recheckCreateSchema>

const pageOnly = z.object(pageFields)
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
