import type { User as SessionUser } from '#auth-utils'

export type Actor = Pick<SessionUser, 'id' | 'role' | 'workspaceId' | 'clientId'> & { name?: string }

// The one place the tenancy rule is written: everyone sees their own workspace, and a property manager
// only their own client's part of it (sites, units, coverings, jobs, reports). Every query and guard asks here.

/** The client an actor is held to: a property manager's own (never none), or undefined for the workspace's staff. */
export function clientLimit(actor: Pick<Actor, 'role' | 'clientId'>): number | undefined {
  return actor.role === 'manager' ? actor.clientId ?? -1 : undefined
}

/** Whether a record of this client (already known to be in the actor's workspace) is the actor's to see. */
export function seesClient(actor: Pick<Actor, 'role' | 'clientId'>, clientId: number | null | undefined): boolean {
  const limit = clientLimit(actor)
  return limit === undefined || limit === clientId
}

/** The same limit as a Sequelize `where` on a model with `workspaceId` and `clientId` (Site, Job). */
export function siteWhere(actor: Actor): { workspaceId: number, clientId?: number } {
  const clientId = clientLimit(actor)
  return clientId === undefined ? { workspaceId: actor.workspaceId } : { workspaceId: actor.workspaceId, clientId }
}

/**
 * The SQL condition limiting `sites` (aliased `s`) to what the actor may see: their workspace,
 * and for a property manager only their client's sites. Values go in as bind replacements.
 */
export function siteScopeSql(actor: Actor, alias = 's') {
  const clientId = clientLimit(actor)
  if (clientId !== undefined) {
    return { sql: `${alias}.workspace_id = :scopeWorkspaceId AND ${alias}.client_id = :scopeClientId`, replacements: { scopeWorkspaceId: actor.workspaceId, scopeClientId: clientId } }
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
