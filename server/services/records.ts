import type { Model } from 'sequelize'
import type { Actor } from './scope'
import { logActivity } from './activity'

// Register writes that every resource shares: change the row, then say so in the activity log.

export async function createLogged<M extends Model>(create: () => Promise<M>, actor: Actor, entity: string, detail: Record<string, unknown>) {
  const row = await create()
  await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: `${entity}.created`, entity, entityId: row.get('id') as number, detail })
  return row
}

export async function updateLogged<M extends Model>(row: M, changes: Record<string, unknown>, actor: Actor, entity: string) {
  const before = Object.fromEntries(Object.keys(changes).map(k => [k, row.get(k)]))
  await row.update(changes)
  await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: `${entity}.updated`, entity, entityId: row.get('id') as number, detail: { before, after: changes } })
  return row
}
