import { describe, expect, it } from 'vitest'
import { h } from 'vue'
import { mount } from '@vue/test-utils'
import ListView from '~/components/ListView.vue'
import EmptyState from '~/components/EmptyState.vue'
import ListPager from '~/components/ListPager.vue'

// The frame every list page shares: filters, load error, empty state, cards and table, pager.
interface Row { id: number, name: string }
const page = (items: Row[], total = items.length, at = 1) => ({ items, total, page: at, pageSize: 2 })
const global = {
  components: { EmptyState, ListPager },
  stubs: { AppIcon: true, LoadError: { props: ['error', 'what'], emits: ['retry'], template: '<div role="alert">Could not load {{ what }}<button @click="$emit(\'retry\')">Try again</button></div>' } },
}
const empty = { icon: 'sites', title: 'No sites yet', body: 'Sites appear here once an officer adds them.', filteredTitle: 'No sites match', filteredBody: 'Try other words, or clear the filters.' }

function mountList(props: Record<string, unknown>) {
  return mount(ListView<Row>, {
    props: { data: null, error: null, what: 'the sites', noun: 'sites', empty, ...props },
    slots: {
      filters: () => h('input', { 'aria-label': 'Search sites' }),
      card: ({ item }: { item: Row }) => h('article', item.name),
      table: ({ items }: { items: Row[] }) => h('table', items.map(r => h('tr', r.name))),
    },
    global,
  })
}

describe('the list frame', () => {
  it('shows the rows as cards for a phone and as a table for a desktop, with the pager counting them', async () => {
    const w = mountList({ data: page([{ id: 1, name: 'Wattle Court' }, { id: 2, name: 'Northbank Terrace' }], 3) })
    expect(w.find('section[aria-label="Search and filters"] input').exists()).toBe(true)
    expect(w.findAll('ul.lg\\:hidden li article').map(a => a.text())).toEqual(['Wattle Court', 'Northbank Terrace'])
    expect(w.findAll('div.hidden.lg\\:block table tr')).toHaveLength(2)
    expect(w.find('nav').text()).toContain('1–2 of 3 sites')
    await w.findAll('nav button').at(-1)!.trigger('click')
    expect(w.emitted('page')).toEqual([[2]])
  })

  it('dims the rows while the next page loads and says it is busy', () => {
    const w = mountList({ data: page([{ id: 1, name: 'Wattle Court' }]), pending: true })
    const frame = w.find('[aria-busy]')
    expect(frame.attributes('aria-busy')).toBe('true')
    expect(frame.classes()).toContain('opacity-60')
  })

  it('says the list is empty, and offers to clear a search that found nothing', async () => {
    const none = mountList({ data: page([]) })
    expect(none.text()).toContain('No sites yet')
    expect(none.find('button.btn-quiet').exists()).toBe(false)
    const narrowed = mountList({ data: page([]), filtered: true })
    expect(narrowed.text()).toContain('No sites match')
    expect(narrowed.text()).toContain('Try other words, or clear the filters.')
    await narrowed.find('button.btn-quiet').trigger('click')
    expect(narrowed.emitted('clear')).toHaveLength(1)
  })

  it('shows a load error with a retry in place of the rows and the pager', async () => {
    const w = mountList({ data: page([{ id: 1, name: 'Wattle Court' }]), error: new Error('offline') })
    expect(w.find('[role="alert"]').text()).toContain('Could not load the sites')
    expect(w.find('article').exists()).toBe(false)
    expect(w.find('nav').exists()).toBe(false)
    await w.find('[role="alert"] button').trigger('click')
    expect(w.emitted('retry')).toHaveLength(1)
  })

  it('puts one list for every width in a single card', () => {
    const w = mount(ListView<Row>, {
      props: { data: page([{ id: 1, name: 'Ada' }]), error: null, what: 'the users', noun: 'users', empty, clearLabel: null },
      slots: { list: ({ items }: { items: Row[] }) => h('table', items.map(r => h('tr', r.name))) },
      global,
    })
    expect(w.find('div.card table tr').text()).toBe('Ada')
    expect(w.find('section').exists()).toBe(false)
    expect(w.find('ul').exists()).toBe(false)
  })
})
