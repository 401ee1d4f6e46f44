import type { MaybeRefOrGetter, Ref } from 'vue'
import type { ListResult } from '#shared/schemas/common'
import type { CoveringRow, OpeningRow, SiteRow, UnitRow } from '#shared/types/register'

// The fetches of the fitting pages and the office's totals, each with its cache key (see siteData.ts).
// useRequestFetch passes the session cookie along when these run on the server.

export const fitKeys = {
  search: 'fit-search',
  sites: 'fit-sites',
  units: (siteId: number | string) => `fit-units-${siteId}`,
  openings: (siteId: number | string) => `fit-openings-${siteId}`,
  coverings: (siteId: number | string) => `fit-coverings-${siteId}`,
  totals: 'overview-totals',
} as const

/** Sites, units and coverings matching a search (six of each), or null with no search. */
export function useFitSearch(q: Readonly<Ref<string>>) {
  const requestFetch = useRequestFetch()
  return useAsyncData(fitKeys.search, async () => {
    if (!q.value) return null
    const query = { q: q.value, pageSize: 6 }
    const [sites, units, coverings] = await Promise.all([
      requestFetch<ListResult<SiteRow>>('/api/sites', { query }),
      requestFetch<ListResult<UnitRow>>('/api/units', { query }),
      requestFetch<ListResult<CoveringRow>>('/api/coverings', { query }),
    ])
    return { sites: sites.items, units: units.items, coverings: coverings.items }
  }, { watch: [q] })
}

/** The sites assigned to the signed-in person or, with none assigned (usual for an officer), every site. */
export function useFitSites() {
  const requestFetch = useRequestFetch()
  return useAsyncData(fitKeys.sites, async () => {
    const mine = await requestFetch<ListResult<SiteRow>>('/api/sites', { query: { assigned: 'me', sort: 'name', pageSize: 50 } })
    if (mine.items.length) return { assigned: true, items: mine.items }
    const all = await requestFetch<ListResult<SiteRow>>('/api/sites', { query: { sort: 'name', pageSize: 50 } })
    return { assigned: false, items: all.items }
  })
}

function useRegisterLevel() {
  const requestFetch = useRequestFetch()
  return <T>(path: string, query: Record<string, unknown>) =>
    requestFetch<ListResult<T>>(path, { query: { ...query, pageSize: 100, sort: 'ref' } }).then(r => r.items)
}

/** A site's units, then the openings of the chosen unit, then the coverings of the chosen opening. */
export function useFitUnits(siteId: MaybeRefOrGetter<number | string>) {
  const list = useRegisterLevel()
  return useAsyncData(fitKeys.units(toValue(siteId)), () => list<UnitRow>('/api/units', { siteId: toValue(siteId) }))
}

export function useFitOpenings(siteId: MaybeRefOrGetter<number | string>, unitId: Readonly<Ref<number | null>>) {
  const list = useRegisterLevel()
  return useAsyncData(fitKeys.openings(toValue(siteId)), () => (unitId.value ? list<OpeningRow>('/api/openings', { unitId: unitId.value }) : Promise.resolve([])), { watch: [unitId] })
}

export function useFitCoverings(siteId: MaybeRefOrGetter<number | string>, openingId: Readonly<Ref<number | null>>) {
  const list = useRegisterLevel()
  return useAsyncData(fitKeys.coverings(toValue(siteId)), () => (openingId.value ? list<CoveringRow>('/api/coverings', { openingId: openingId.value }) : Promise.resolve([])), { watch: [openingId] })
}

/** How many coverings are non-compliant, incomplete and unchecked, counted exactly through the list endpoint. */
export function useVerdictTotals() {
  const requestFetch = useRequestFetch()
  const totalOf = (verdict: string) => requestFetch<ListResult<CoveringRow>>('/api/coverings', { query: { verdict, pageSize: 1 } }).then(r => r.total)
  return useAsyncData(fitKeys.totals, async () => {
    const [failing, incomplete, unchecked] = await Promise.all([totalOf('non_compliant'), totalOf('incomplete'), totalOf('unchecked')])
    return { failing, incomplete, unchecked }
  })
}
