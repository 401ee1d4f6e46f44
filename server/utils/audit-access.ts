import type { H3Event } from 'h3'
import { Audit } from '../models'
import type { Site } from '../models'

/** Tenant guard for an audit: its site must be one the user may see (404 otherwise). */
export async function requireAuditAccess(event: H3Event, id: number): Promise<{ audit: Audit, site: Site }> {
  await requireUser(event)
  useDb()
  const audit = await Audit.findByPk(id)
  if (!audit) throw createError({ statusCode: 404, message: 'Audit not found' })
  const site = await requireSiteAccess(event, audit.siteId).catch(() => {
    throw createError({ statusCode: 404, message: 'Audit not found' })
  })
  return { audit, site }
}

export function auditError(err: unknown): never {
  const e = err as { field?: string, statusCode?: number, message?: string, name?: string }
  if (e && e.field && e.statusCode) throw createError({ statusCode: e.statusCode, message: e.message, data: { fields: { [e.field]: e.message } } })
  throw err
}
