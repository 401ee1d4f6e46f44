import type { MaybeRefOrGetter } from 'vue'
import type { ListResult } from '#shared/schemas/common'
import type { SiteDetail, SiteRow, UnitRow } from '#shared/types/register'
import type { AuditListRow, ReportDispatch, SiteOverview } from './auditRows'

// Every fetch of a site or of sites, each with its cache key, so pages never type one. Two callers with one key
// share one request and one cached answer (the site frame and the fitting page both read `site-<id>`).
// A key is made once, when the page sets up: a page for another id is a new page.

type Id = MaybeRefOrGetter<number | string>
type Query = MaybeRefOrGetter<Record<string, string | number | undefined>>

export const siteKeys = {
  one: (id: number | string) => `site-${id}`,
  audits: (id: number | string) => `site-audits-${id}`,
  overview: (id: number | string) => `site-overview-${id}`,
  units: (id: number | string) => `site-units-${id}`,
  reports: (id: number | string) => `site-reports-${id}`,
  list: 'sites-list',
  options: 'site-options',
  assigned: 'today-sites',
  worst: 'overview-worst-sites',
} as const

/** One site with its counts; a missing or foreign one is an error with status 404. */
export function useSite(id: Id) {
  return useFetch<SiteDetail>(() => `/api/sites/${toValue(id)}`, { key: siteKeys.one(toValue(id)) })
}

/** The sites list page: one page of sites for `query` (from useListQuery's apiQuery). */
export function useSiteList(query: Query) {
  return useFetch<ListResult<SiteRow>>('/api/sites', { key: siteKeys.list, query })
}

/** Up to 100 sites by name, for a site filter or picker. */
export function useSiteOptions() {
  return useFetch<ListResult<SiteRow>>('/api/sites', { key: siteKeys.options, query: { pageSize: 100, sort: 'name' } })
}

/** The sites assigned to the signed-in installer. */
export function useAssignedSites() {
  return useFetch<ListResult<SiteRow>>('/api/sites', { key: siteKeys.assigned, query: { assigned: 'me', sort: 'name', pageSize: 50 } })
}

/** The five sites with the most non-compliant coverings. */
export function useWorstSites() {
  return useFetch<ListResult<SiteRow>>('/api/sites', { key: siteKeys.worst, query: { sort: '-failing', pageSize: 5 } })
}

export function useSiteAudits(id: Id) {
  return useFetch<{ items: AuditListRow[], total: number }>(() => `/api/sites/${toValue(id)}/audits`, { key: siteKeys.audits(toValue(id)) })
}

export function useSiteOverview(id: Id) {
  return useFetch<SiteOverview>(() => `/api/sites/${toValue(id)}/overview`, { key: siteKeys.overview(toValue(id)) })
}

/** The site's units by reference (up to 100). */
export function useSiteUnits(id: Id) {
  return useFetch<ListResult<UnitRow>>('/api/units', { key: siteKeys.units(toValue(id)), query: { siteId: toValue(id), pageSize: 100, sort: 'ref' } })
}

/** The reports sent for a site, newest first, ten a page. */
export function useSiteReports(id: Id, page: MaybeRefOrGetter<number>) {
  return useFetch<ListResult<ReportDispatch>>(() => `/api/sites/${toValue(id)}/reports`, { key: siteKeys.reports(toValue(id)), query: { page, pageSize: 10 } })
}
