import { defineStore } from 'pinia'
import type { CheckResult, ControlType } from '~/rules'
import type { DraftValue, Measurements } from '~/composables/fittingRecord'
import type { LengthUnit } from '~/composables/measure'

export type PhotoKind = 'whole' | 'tension_device' | 'cleat' | 'labels' | 'defect'

/** A photo taken on this visit. Until it is `stored` on the server its file waits in this browser's IndexedDB. */
export interface VisitPhoto {
  localId: string
  kind: PhotoKind
  fileName: string
  sizeBytes: number
  state: 'uploading' | 'waiting' | 'stored' | 'rejected'
  /** Share of the upload sent, 0 to 1. */
  progress: number
  id: number | null
  url: string | null
  thumbUrl: string | null
  problem: string | null
}

export interface SignOffBody {
  kind: 'fitting' | 'audit' | 'correction'
  measurements: Measurements
  notes: string | null
  clientKey: string
  inspectedAt: string
  correctsId: number | null
  auditId: number | null
}

export interface FittingDraft {
  key: string
  userId: number
  coveringId: number
  /** Enough to list the draft on Today without the network. */
  label: { ref: string, siteName: string, unitRef: string, room: string }
  /** Made once per draft, so sending the same sign-off twice saves it once. */
  clientKey: string
  control: ControlType
  values: Record<string, DraftValue>
  units: Record<string, LengthUnit>
  notes: string
  photos: VisitPhoto[]
  auditId: number | null
  correctsId: number | null
  state: 'editing' | 'queued' | 'sending'
  /** The sign-off as pressed, with the control to save on the covering first when it was changed. */
  queued: { body: SignOffBody, control: ControlType | null } | null
  problem: string | null
  serverErrors: Record<string, string>
  updatedAt: string
}

export interface SentSignOff { inspectionId: number, verdict: string, rulesVersion: string, replayed: boolean, auditId: number | null, result: CheckResult | null }

const KEY = 'tautline.fittingDrafts'

function newClientKey(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16))
  return `fit-${Array.from(bytes, b => b.toString(16).padStart(2, '0')).join('')}`
}

/**
 * Unsent fittings, one per covering and user, kept in localStorage so a reload or a dead phone
 * signal loses nothing. Sign-offs waiting for signal sit here too, until they are sent.
 */
export const useFittingDraftsStore = defineStore('fittingDrafts', () => {
  const drafts = ref<Record<string, FittingDraft>>({})
  /** Sign-offs sent in this session, by covering id; never persisted (the server has them). */
  const sent = ref<Record<number, SentSignOff>>({})
  let loaded = false

  function load() {
    if (loaded || !import.meta.client) return
    loaded = true
    try {
      const parsed = JSON.parse(localStorage.getItem(KEY) ?? '{}') as Record<string, FittingDraft>
      for (const d of Object.values(parsed)) {
        // A send or upload cut off by the reload is simply tried again.
        if (d.state === 'sending') d.state = 'queued'
        for (const p of d.photos) if (p.state === 'uploading') p.state = 'waiting'
      }
      drafts.value = parsed && typeof parsed === 'object' ? parsed : {}
    }
    catch {
      drafts.value = {}
    }
  }

  function save() {
    try {
      localStorage.setItem(KEY, JSON.stringify(drafts.value))
    }
    catch {
      // Storage full or blocked: the draft still lives in this tab.
    }
  }

  // Set up with the store, not in load(): a watcher made there would stop with the page that first loaded it.
  watch(drafts, () => {
    if (loaded && import.meta.client) save()
  }, { deep: true })

  const keyOf = (userId: number, coveringId: number) => `${userId}:${coveringId}`
  const find = (userId: number, coveringId: number) => drafts.value[keyOf(userId, coveringId)] ?? null
  const mine = (userId: number) => Object.values(drafts.value).filter(d => d.userId === userId).sort((a, b) => b.updatedAt.localeCompare(a.updatedAt))

  function start(init: Pick<FittingDraft, 'userId' | 'coveringId' | 'label' | 'control'> & Partial<FittingDraft>): FittingDraft {
    const key = keyOf(init.userId, init.coveringId)
    drafts.value[key] ??= {
      values: {}, units: {}, notes: '', photos: [], auditId: null, correctsId: null, state: 'editing', queued: null, problem: null,
      serverErrors: {}, ...init, key, clientKey: newClientKey(), updatedAt: new Date().toISOString(),
    }
    return drafts.value[key]!
  }

  function touch(d: FittingDraft) {
    d.updatedAt = new Date().toISOString()
  }

  function setValue(d: FittingDraft, name: string, value: DraftValue) {
    d.values[name] = value
    if (d.serverErrors[name]) d.serverErrors = Object.fromEntries(Object.entries(d.serverErrors).filter(([k]) => k !== name))
    touch(d)
  }

  function remove(key: string) {
    const { [key]: _gone, ...rest } = drafts.value
    drafts.value = rest
  }

  return { drafts, sent, load, find, mine, start, touch, setValue, remove }
})
