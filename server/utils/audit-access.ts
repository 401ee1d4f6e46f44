import type { H3Event } from 'h3'
import { Audit, Site } from '../models'
import { siteWhere } from '../services/scope'

/** Tenant guard for an audit: its site must be one the user may see (404 otherwise). */
export async function requireAuditAccess(event: H3Event, id: number): Promise<{ audit: Audit, site: Site }> {
  const user = await requireUser(event)
  useDb()
  const audit = await Audit.findByPk(id)
  const site = audit && await Site.findOne({ where: { id: audit.siteId, ...siteWhere(user) } })
  if (!audit || !site) throw createError({ statusCode: 404, message: 'Audit not found' })
  return { audit, site }
}
