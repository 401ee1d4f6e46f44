import type { Transaction } from 'sequelize'
import { ActivityEntry } from '../models'

/** Appends to the activity log: who did what to which record. The table refuses edits. */
export function logActivity(entry: { workspaceId: number, userId: number | null, action: string, entity: string, entityId: number | null, detail?: Record<string, unknown> }, transaction?: Transaction) {
  return ActivityEntry.create({ ...entry, detail: entry.detail ?? {} }, { transaction })
}
