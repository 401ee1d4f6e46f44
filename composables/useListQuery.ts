import type { LocationQuery } from 'vue-router'

interface ListQueryOptions<F extends Record<string, string>> {
  /** Default sort, `field` or `-field`. */
  sort: string
  pageSize?: number
  /** Filter names with their default values ('' means no filter). */
  filters?: F
}

function first(value: LocationQuery[string] | undefined): string {
  const v = Array.isArray(value) ? value[0] : value
  return typeof v === 'string' ? v : ''
}

/**
 * Page, sort, search and filters of one list, kept in the URL query so a list survives a reload,
 * a shared link and the back button. `apiQuery` is ready to hand to useFetch.
 */
export function useListQuery<const F extends Record<string, string> = Record<never, string>>(options: ListQueryOptions<F>) {
  const route = useRoute()
  const router = useRouter()
  const defaults: Record<string, string> = { sort: options.sort, q: '', page: '1', ...(options.filters ?? {}) }
  const pageSize = options.pageSize ?? 25

  const read = (key: string) => first(route.query[key]) || defaults[key] || ''
  const page = computed(() => Math.max(1, Number.parseInt(read('page'), 10) || 1))
  const sort = computed(() => read('sort'))
  const q = computed(() => read('q'))
  const filters = computed(() => {
    const out: Record<string, string> = {}
    for (const key of Object.keys(options.filters ?? {})) out[key] = read(key)
    return out as { [K in keyof F]: string }
  })

  /** Changes some keys; any change other than the page sends the list back to page 1. */
  function update(patch: Record<string, string | number | null | undefined>) {
    const merged: Record<string, string> = {}
    for (const [key, value] of Object.entries(route.query)) if (typeof value === 'string') merged[key] = value
    for (const [key, value] of Object.entries(patch)) merged[key] = value == null ? '' : String(value)
    if (!('page' in patch)) merged.page = ''
    // Defaults stay out of the URL, so a plain link and a reset list look the same.
    const next = Object.fromEntries(Object.entries(merged).filter(([key, value]) => value !== '' && value !== defaults[key]))
    return router.replace({ query: next })
  }

  const apiQuery = computed(() => {
    const out: Record<string, string | number> = { page: page.value, pageSize, sort: sort.value }
    if (q.value) out.q = q.value
    for (const [key, value] of Object.entries(filters.value)) if (value) out[key] = value
    return out
  })

  const isFiltered = computed(() => !!q.value || Object.values(filters.value).some(Boolean))

  function reset() {
    const cleared: Record<string, string> = { q: '' }
    for (const key of Object.keys(options.filters ?? {})) cleared[key] = ''
    return update(cleared)
  }

  return {
    page, sort, q, filters, pageSize, apiQuery, isFiltered,
    setPage: (p: number) => update({ page: p }),
    setSort: (s: string) => update({ sort: s }),
    setSearch: (text: string) => update({ q: text.trim() }),
    setFilter: (key: keyof F & string, value: string) => update({ [key]: value }),
    reset,
  }
}

export type ListQuery = ReturnType<typeof useListQuery>
