import { defineStore } from 'pinia'

export interface RecentSite { id: number, name: string, ref: string }

const KEY = 'tautline.recentSites'
const MAX = 5

/**
 * The last few sites this browser opened, so an installer on a ladder gets back to a site in one tap.
 * Kept in localStorage per browser; it holds names and ids only, never verdicts or counts.
 */
export const useRecentSitesStore = defineStore('recentSites', () => {
  const sites = ref<RecentSite[]>([])
  let loaded = false

  function load() {
    if (loaded || !import.meta.client) return
    loaded = true
    try {
      const parsed = JSON.parse(localStorage.getItem(KEY) ?? '[]') as RecentSite[]
      sites.value = Array.isArray(parsed) ? parsed.slice(0, MAX) : []
    }
    catch {
      sites.value = []
    }
  }

  function remember(site: RecentSite) {
    load()
    sites.value = [{ id: site.id, name: site.name, ref: site.ref }, ...sites.value.filter(s => s.id !== site.id)].slice(0, MAX)
    if (import.meta.client) localStorage.setItem(KEY, JSON.stringify(sites.value))
  }

  function forget() {
    sites.value = []
    if (import.meta.client) localStorage.removeItem(KEY)
  }

  return { sites, load, remember, forget }
})
