import type { H3Event } from 'h3'
import { Client, Covering, Opening, Site, Unit, User } from '../models'
import { seesClient, siteWhere } from '../services/scope'

/**
 * Tenant guards: each checks the session first (401 whatever the id), then loads a record the signed-in user
 * may see, or answers 404 — never 403 — so another workspace's or client's records are indistinguishable from
 * missing ones. What a user may see is decided in server/services/scope.ts.
 */
export async function requireSiteAccess(event: H3Event, siteId: number): Promise<Site> {
  const user = await requireUser(event)
  useDb()
  const site = await Site.findOne({ where: { id: siteId, ...siteWhere(user) } })
  if (!site) throw createError({ statusCode: 404, message: 'Site not found' })
  return site
}

export async function requireClientAccess(event: H3Event, clientId: number): Promise<Client> {
  const user = await requireUser(event)
  useDb()
  const client = await Client.findOne({ where: { id: clientId, workspaceId: user.workspaceId } })
  if (!client || !seesClient(user, client.id)) {
    throw createError({ statusCode: 404, message: 'Client not found' })
  }
  return client
}

type SiteOwned = typeof Unit | typeof Opening | typeof Covering
const labels = new Map<SiteOwned, string>([[Unit, 'Unit'], [Opening, 'Opening'], [Covering, 'Covering']])

/** Loads a unit, opening or covering and checks its site, in one helper for all three. */
export async function requireInSite<M extends SiteOwned>(event: H3Event, model: M, id: number): Promise<{ record: InstanceType<M>, site: Site }> {
  const user = await requireUser(event)
  useDb()
  const record = await (model as typeof Unit).findByPk(id) as InstanceType<M> | null
  const site = record && await Site.findOne({ where: { id: record.siteId, ...siteWhere(user) } })
  if (!record || !site) throw createError({ statusCode: 404, message: `${labels.get(model)} not found` })
  return { record, site }
}

/** A person in the signed-in user's workspace (404 for anyone else's). */
export async function requireWorkspaceUser(event: H3Event, id: number): Promise<User> {
  const actor = await requireUser(event)
  useDb()
  const user = await User.findOne({ where: { id, workspaceId: actor.workspaceId } })
  if (!user) throw createError({ statusCode: 404, message: 'User not found' })
  return user
}
