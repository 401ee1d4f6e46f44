import { describe, expect, it } from 'vitest'
import { defineComponent, h, nextTick } from 'vue'
import { mount } from '@vue/test-utils'
import { createMemoryHistory, createRouter } from 'vue-router'
import { useListQuery } from '~/composables/useListQuery'

// The list's page, sort, search and filters live in the URL query; drive it through a real router in memory.
async function setup(path = '/sites') {
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/sites', component: { render: () => null } }] })
  await router.push(path)
  await router.isReady()
  let list!: ReturnType<typeof useListQuery<{ jurisdiction: string, status: string }>>
  mount(defineComponent({
    setup() {
      list = useListQuery({ sort: 'name', pageSize: 20, filters: { jurisdiction: '', status: 'open' } })
      return () => h('div')
    },
  }), { global: { plugins: [router] } })
  const query = () => router.currentRoute.value.query
  return { list, router, query }
}

describe('a list query kept in the URL', () => {
  it('starts from the defaults, which stay out of the URL', async () => {
    const { list, query } = await setup()
    expect(list.page.value).toBe(1)
    expect(list.sort.value).toBe('name')
    expect(list.filters.value).toEqual({ jurisdiction: '', status: 'open' })
    expect(list.isFiltered.value).toBe(true)
    expect(list.apiQuery.value).toEqual({ page: 1, pageSize: 20, sort: 'name', status: 'open' })
    expect(query()).toEqual({})
  })

  it('reads a shared link back', async () => {
    const { list } = await setup('/sites?page=3&sort=-failing&q=wattle&jurisdiction=AU')
    expect(list.page.value).toBe(3)
    expect(list.q.value).toBe('wattle')
    expect(list.apiQuery.value).toEqual({ page: 3, pageSize: 20, sort: '-failing', q: 'wattle', jurisdiction: 'AU', status: 'open' })
  })

  it('sends the list back to page 1 on any change but the page, and trims the search', async () => {
    const { list, query } = await setup('/sites?page=4')
    await list.setSearch('  Ironbark  ')
    expect(query()).toEqual({ q: 'Ironbark' })
    await list.setPage(2)
    expect(query()).toEqual({ q: 'Ironbark', page: '2' })
    await list.setFilter('jurisdiction', 'CA')
    expect(query()).toEqual({ q: 'Ironbark', jurisdiction: 'CA' })
    await list.setPage(2)
    await list.setSort('-updatedAt')
    expect(query()).toEqual({ q: 'Ironbark', jurisdiction: 'CA', sort: '-updatedAt' })
    await nextTick()
    expect(list.apiQuery.value).toEqual({ page: 1, pageSize: 20, sort: '-updatedAt', q: 'Ironbark', jurisdiction: 'CA', status: 'open' })
  })

  it('drops a value that is back at its default, and clears search and filters on reset but keeps the sort', async () => {
    const { list, query } = await setup('/sites?sort=ref&q=x&jurisdiction=EU&status=closed')
    await list.setSort('name')
    expect(query()).toEqual({ q: 'x', jurisdiction: 'EU', status: 'closed' })
    await list.setSort('ref')
    await list.reset()
    expect(query()).toEqual({ sort: 'ref' })
    expect(list.filters.value).toEqual({ jurisdiction: '', status: 'open' })
  })

  it('reads a bad page number as the first page', async () => {
    for (const page of ['0', '-2', 'abc', '']) {
      const { list } = await setup(`/sites?page=${page}`)
      expect(list.page.value, page).toBe(1)
    }
  })

  it('takes the first of a repeated key', async () => {
    const { list } = await setup('/sites?q=one&q=two')
    expect(list.q.value).toBe('one')
  })
})
