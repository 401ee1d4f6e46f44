import type { H3Event } from 'h3'
import { Client, Covering, Opening, Site, Unit } from '../models'
import { siteWhere } from '../services/scope'

/**
 * Tenant guards: each loads a record the signed-in user may see, or answers 404 — never 403 —
 * so another workspace's or client's records are indistinguishable from missing ones.
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
  if (!client || (user.role === 'manager' && user.clientId !== client.id)) {
    throw createError({ statusCode: 404, message: 'Client not found' })
  }
  return client
}

type SiteOwned = typeof Unit | typeof Opening | typeof Covering
const labels = new Map<SiteOwned, string>([[Unit, 'Unit'], [Opening, 'Opening'], [Covering, 'Covering']])

/** Loads a unit, opening or covering and checks its site, in one helper for all three. */
export async function requireInSite<M extends SiteOwned>(event: H3Event, model: M, id: number): Promise<{ record: InstanceType<M>, site: Site }> {
  useDb()
  const record = await (model as typeof Unit).findByPk(id) as InstanceType<M> | null
  if (!record) throw createError({ statusCode: 404, message: `${labels.get(model)} not found` })
  try {
    const site = await requireSiteAccess(event, record.siteId)
    return { record, site }
  }
  catch (err) {
    if ((err as { statusCode?: number }).statusCode === 404) throw createError({ statusCode: 404, message: `${labels.get(model)} not found` })
    throw err
  }
}
