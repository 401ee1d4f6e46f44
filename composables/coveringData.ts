import type { MaybeRefOrGetter } from 'vue'
import type { ListResult } from '#shared/schemas/common'
import type { CoveringDetail, CoveringRow } from '#shared/types/register'
import type { RemedyRow } from './auditRows'

// Every fetch of a covering or of coverings, each with its cache key (see siteData.ts).

type Id = MaybeRefOrGetter<number | string>
type Query = MaybeRefOrGetter<Record<string, string | number | undefined>>

export interface PhotoListRow { id: number, kind: string, createdAt: string }

export const coveringKeys = {
  one: (id: number | string) => `covering-${id}`,
  photos: (id: number | string) => `covering-photos-${id}`,
  remedies: (id: number | string) => `covering-fixes-${id}`,
  inSite: (siteId: number | string) => `site-coverings-${siteId}`,
  allInSite: (siteId: number | string) => `site-coverings-for-removal-${siteId}`,
  recentFits: 'today-fittings',
  failing: 'overview-failures',
} as const

/** One covering with its inspections and removal. */
export function useCovering(id: Id) {
  return useFetch<CoveringDetail>(() => `/api/coverings/${toValue(id)}`, { key: coveringKeys.one(toValue(id)) })
}

/** A site's coverings list: one page for `query` (search, filters, sort and page from useListQuery). */
export function useSiteCoverings(siteId: Id, query: Query) {
  return useFetch<ListResult<CoveringRow>>('/api/coverings', { key: coveringKeys.inSite(toValue(siteId)), query })
}

/** Every covering of a site by reference (up to 100), to choose one from. */
export function useAllSiteCoverings(siteId: Id) {
  return useFetch<ListResult<CoveringRow>>('/api/coverings', { key: coveringKeys.allInSite(toValue(siteId)), query: { siteId: toValue(siteId), pageSize: 100, sort: 'ref' } })
}

/** The last eight coverings inspected. */
export function useRecentFits() {
  return useFetch<ListResult<CoveringRow>>('/api/coverings', { key: coveringKeys.recentFits, query: { sort: '-lastInspectedAt', pageSize: 8 } })
}

/** Non-compliant coverings, for `query` from useListQuery. */
export function useFailingCoverings(query: Query) {
  const withVerdict = computed(() => ({ ...toValue(query), verdict: 'non_compliant' }))
  return useFetch<ListResult<CoveringRow>>('/api/coverings', { key: coveringKeys.failing, query: withVerdict })
}

export function useCoveringPhotos<T = PhotoListRow>(id: Id) {
  return useFetch<{ items: T[], total: number }>(() => `/api/coverings/${toValue(id)}/photos`, { key: coveringKeys.photos(toValue(id)) })
}

/** The covering's open remedies, most urgent first. */
export function useCoveringRemedies(id: Id) {
  return useFetch<{ items: RemedyRow[], total: number }>('/api/fixes', {
    key: coveringKeys.remedies(toValue(id)), query: { coveringId: toValue(id), status: 'open', sort: 'priority', pageSize: 50 },
  })
}
