import type { Model, Sequelize, Transaction } from 'sequelize'
import type { Actor } from './scope'
import { logActivity } from './activity'

// Register writes that every resource shares: change the row, then say so in the activity log.

export async function createLogged<M extends Model>(create: () => Promise<M>, actor: Actor, entity: string, detail: Record<string, unknown>) {
  const row = await create()
  await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: `${entity}.created`, entity, entityId: row.get('id') as number, detail })
  return row
}

/**
 * The register fields the rulebook reads, by entity, and which coverings each one feeds. Editing one after an
 * inspection never moves a verdict: it marks those coverings as changed since their last inspection.
 */
const ruleReadFields: Record<string, { fields: string[], coverings: string }> = {
  covering: { fields: ['productType', 'control', 'madeTo', 'manufacturedOn', 'installedOn'], coverings: 'id = :id' },
  opening: { fields: ['childrensRoom'], coverings: 'opening_id = :id' },
  site: { fields: ['jurisdiction', 'premises'], coverings: 'site_id = :id' },
}

const same = (a: unknown, b: unknown) => (a ?? null) === (b ?? null) || String(a ?? '') === String(b ?? '')

export async function markChangedSinceInspection(db: Sequelize, entity: string, id: number, fields: string[], transaction: Transaction) {
  const feeds = ruleReadFields[entity]
  if (!feeds || !fields.length) return
  // Only coverings with an inspection to differ from; their last verdict stays, shown as last inspected.
  await db.query(`UPDATE coverings SET changed_since_inspection = true, changed_at = now(), updated_at = now(),
      changed_fields = ARRAY(SELECT DISTINCT unnest(changed_fields || ARRAY[:fields]::text[]) ORDER BY 1)
    WHERE ${feeds.coverings} AND last_inspection_id IS NOT NULL AND status = 'in_place'`,
  { transaction, replacements: { id, fields: fields.map(f => `${entity}.${f}`) } })
}

export async function updateLogged<M extends Model>(row: M, changes: Record<string, unknown>, actor: Actor, entity: string) {
  const before = Object.fromEntries(Object.keys(changes).map(k => [k, row.get(k)]))
  const db = row.sequelize as Sequelize
  const changedRuleFields = (ruleReadFields[entity]?.fields ?? []).filter(f => f in changes && changes[f] !== undefined && !same(before[f], changes[f]))
  await db.transaction(async (transaction) => {
    await row.update(changes, { transaction })
    await markChangedSinceInspection(db, entity, row.get('id') as number, changedRuleFields, transaction)
    await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: `${entity}.updated`, entity, entityId: row.get('id') as number,
      detail: { before, after: changes, ...(changedRuleFields.length ? { changedSinceInspection: changedRuleFields } : {}) } }, transaction)
  })
  if (changedRuleFields.length) await row.reload()
  return row
}
