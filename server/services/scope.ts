import type { User as SessionUser } from '#auth-utils'

export type Actor = Pick<SessionUser, 'id' | 'role' | 'workspaceId' | 'clientId'> & { name?: string }

/** The same limit as a Sequelize `where` on the Site model. */
export function siteWhere(actor: Actor): { workspaceId: number, clientId?: number } {
  return actor.role === 'manager' ? { workspaceId: actor.workspaceId, clientId: actor.clientId ?? -1 } : { workspaceId: actor.workspaceId }
}

/**
 * The SQL condition limiting `sites` (aliased `s`) to what the actor may see: their workspace,
 * and for a property manager only their client's sites. Values go in as bind replacements.
 */
export function siteScopeSql(actor: Actor, alias = 's') {
  if (actor.role === 'manager') {
    return { sql: `${alias}.workspace_id = :scopeWorkspaceId AND ${alias}.client_id = :scopeClientId`, replacements: { scopeWorkspaceId: actor.workspaceId, scopeClientId: actor.clientId ?? -1 } }
  }
  return { sql: `${alias}.workspace_id = :scopeWorkspaceId`, replacements: { scopeWorkspaceId: actor.workspaceId } }
}

/** `-name` → `name DESC`, mapped through a whitelist of columns. */
export function orderBy(sort: string, columns: Record<string, string>, tiebreak: string) {
  const desc = sort.startsWith('-')
  const key = desc ? sort.slice(1) : sort
  const column = columns[key]
  if (!column) throw new Error(`unsortable field ${key}`)
  return `${column} ${desc ? 'DESC' : 'ASC'} NULLS LAST, ${tiebreak}`
}

export function likePattern(q: string) {
  return `%${q.replace(/[\\%_]/g, m => `\\${m}`)}%`
}
