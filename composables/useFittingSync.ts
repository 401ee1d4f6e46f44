import type { ControlType } from '~/rules'
import type { FittingDraft, PhotoKind, SentSignOff, VisitPhoto } from '~/stores/fittingDrafts'
import { dropPhotoFile, keepPhotoFile, readPhotoFile } from './photoKeep'
import { readApiError, sentence } from './useApiError'

export const PHOTO_MAX_BYTES = 15 * 1024 * 1024

interface StoredPhoto { id: number, url: string, thumbUrl: string | null }
type UploadReply = { ok: true, photo: StoredPhoto } | { ok: false, retry: boolean, message: string }

const NO_SIGNAL = 'Waiting for signal — will send automatically.'
const fallbackMessages: Record<number, string> = {
  413: 'The photo is larger than 15 MB.',
  415: 'This file is not a JPEG, PNG, WebP or HEIC photo.',
  503: 'Photo storage is unreachable just now; the photo is kept on this phone and will be sent again.',
}

// XMLHttpRequest, not fetch: only it reports upload progress, which matters on a slow phone link.
function upload(coveringId: number, kind: PhotoKind, file: Blob, fileName: string, onProgress: (share: number) => void): Promise<UploadReply> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', `/api/coverings/${coveringId}/photos`)
    xhr.setRequestHeader('accept', 'application/json')
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total)
    }
    xhr.onload = () => {
      let body: { message?: string } & Partial<StoredPhoto> | null = null
      try {
        body = JSON.parse(xhr.responseText)
      }
      catch { /* not JSON: a proxy's page */ }
      if (xhr.status === 201 && body?.id) return resolve({ ok: true, photo: body as StoredPhoto })
      const message = sentence(body?.message ?? fallbackMessages[xhr.status] ?? `The photo was not stored (error ${xhr.status}).`)
      resolve({ ok: false, retry: xhr.status >= 500 || xhr.status === 401 || xhr.status === 0, message: xhr.status === 401 ? 'Your session has ended: sign in again and the photo will be sent.' : message })
    }
    xhr.onerror = () => resolve({ ok: false, retry: true, message: NO_SIGNAL })
    const form = new FormData()
    form.append('kind', kind)
    form.append('file', file, fileName)
    xhr.send(form)
  })
}

const online = ref(true)
const inFlight = new Set<string>()
let installed = false

/** Photos, sign-offs and the queue that sends them when the signal comes back. */
export function useFittingSync() {
  const store = useFittingDraftsStore()
  const { user } = useUserSession()

  async function sendPhoto(d: FittingDraft, p: VisitPhoto, file: Blob | null) {
    const blob = file ?? await readPhotoFile(p.localId)
    if (!blob) {
      p.state = 'rejected'
      p.problem = 'The file is no longer on this phone; take the photo again.'
      return
    }
    if (!navigator.onLine) {
      p.state = 'waiting'
      p.problem = NO_SIGNAL
      return
    }
    p.state = 'uploading'
    p.problem = null
    const reply = await upload(d.coveringId, p.kind, blob, p.fileName, (share) => {
      p.progress = share
    })
    if (reply.ok) {
      Object.assign(p, { state: 'stored', progress: 1, id: reply.photo.id, url: reply.photo.url, thumbUrl: reply.photo.thumbUrl, problem: null })
      await dropPhotoFile(p.localId)
    }
    else {
      Object.assign(p, { state: reply.retry ? 'waiting' : 'rejected', progress: 0, problem: reply.message })
      if (!reply.retry) await dropPhotoFile(p.localId)
    }
  }

  /** Adds a photo to the visit and sends it; a message when the file cannot be a photo at all. */
  async function addPhoto(d: FittingDraft, file: File, kind: PhotoKind): Promise<string | null> {
    if (file.size > PHOTO_MAX_BYTES) return `This photo is ${(file.size / 1048576).toFixed(1)} MB; Tautline keeps photos up to 15 MB. Take it again at a lower resolution.`
    const localId = `p${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}`
    d.photos.push({ localId, kind, fileName: file.name || 'photo.jpg', sizeBytes: file.size, state: 'uploading', progress: 0, id: null, url: null, thumbUrl: null, problem: null })
    store.touch(d)
    const photo = d.photos[d.photos.length - 1]!
    await keepPhotoFile(localId, file)
    await sendPhoto(d, photo, file)
    return null
  }

  async function removePhoto(d: FittingDraft, p: VisitPhoto) {
    d.photos = d.photos.filter(x => x.localId !== p.localId)
    await dropPhotoFile(p.localId)
  }

  async function flush(d: FittingDraft): Promise<void> {
    if (!d.queued || inFlight.has(d.key)) return
    inFlight.add(d.key)
    d.state = 'sending'
    try {
      for (const p of d.photos.filter(x => x.state === 'waiting')) await sendPhoto(d, p, null)
      if (d.photos.some(x => x.state === 'waiting' || x.state === 'uploading')) {
        d.state = 'queued'
        d.problem = NO_SIGNAL
        return
      }
      const { body, control } = d.queued
      const photoIds = d.photos.filter(x => x.state === 'stored' && x.id !== null).map(x => x.id!)
      // One request: a control changed on site is saved with the visit, or (if the visit is refused) not at all.
      const saved = await $fetch<{ id: number, verdict: string, rulesVersion: string, replayed: boolean, result: SentSignOff['result'] }>(
        `/api/coverings/${d.coveringId}/inspections`, { method: 'POST', body: { ...body, photoIds, ...(control ? { covering: { control } } : {}) } })
      store.sent[d.coveringId] = { inspectionId: saved.id, verdict: saved.verdict, rulesVersion: saved.rulesVersion, replayed: saved.replayed, auditId: body.auditId, result: saved.result }
      store.remove(d.key)
    }
    catch (err) {
      const read = readApiError(err)
      if (read.status === 0 || read.status >= 500 || read.status === 401) {
        d.state = 'queued'
        d.problem = read.status === 0 ? NO_SIGNAL : read.status === 401 ? 'Your session has ended: sign in again and the sign-off will be sent.' : `${read.message} It will be sent again automatically.`
      }
      else {
        // Refused: back to the form, with each field's message where it belongs.
        d.state = 'editing'
        d.queued = null
        d.problem = read.message
        d.serverErrors = Object.fromEntries(Object.entries(read.fields).map(([k, v]) => [k.replace(/^(measurements|covering)\./, ''), v]))
      }
    }
    finally {
      inFlight.delete(d.key)
    }
  }

  function signOff(d: FittingDraft, body: NonNullable<FittingDraft['queued']>['body'], control: ControlType | null) {
    d.queued = { body, control }
    d.state = 'queued'
    d.problem = null
    d.serverErrors = {}
    store.touch(d)
    return flush(d)
  }

  async function syncAll() {
    if (!user.value || !navigator.onLine) return
    for (const d of store.mine(user.value.id)) {
      if (d.queued) await flush(d)
      else for (const p of d.photos.filter(x => x.state === 'waiting')) await sendPhoto(d, p, null)
    }
  }

  function install() {
    if (installed || !import.meta.client) return
    installed = true
    store.load()
    online.value = navigator.onLine
    window.addEventListener('online', () => {
      online.value = true
      void syncAll()
    })
    window.addEventListener('offline', () => {
      online.value = false
    })
    // Weak signal often keeps navigator.onLine true while requests fail, so try again now and then.
    setInterval(() => void syncAll(), 30_000)
    void syncAll()
  }

  return { online, install, addPhoto, removePhoto, retryPhoto: (d: FittingDraft, p: VisitPhoto) => sendPhoto(d, p, null), signOff, flush, syncAll }
}
