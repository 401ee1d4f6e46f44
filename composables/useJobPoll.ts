import type { Ref } from 'vue'
import type { JobSummary } from '#shared/types/jobs'

/** Follows a background job in the browser: loads it, then again every second while it is queued or running. */
export function useJobPoll<T extends JobSummary>(url: Ref<string | null>) {
  const job = ref(null) as Ref<T | null>
  const error = ref<unknown>(null)
  const live = computed(() => !!job.value && (job.value.status === 'queued' || job.value.status === 'running'))
  let timer: ReturnType<typeof setTimeout> | undefined
  let stopped = false

  async function load() {
    clearTimeout(timer)
    const asked = url.value
    if (!asked) { job.value = null; return }
    try {
      const fresh = await $fetch<T>(asked) as T
      if (url.value !== asked) return
      job.value = fresh
      error.value = null
    }
    catch (err) {
      error.value = err
    }
    // A failed poll is tried again too: the page keeps following the job through a blip.
    if (!stopped && url.value === asked && (live.value || error.value)) timer = setTimeout(load, 1000)
  }

  async function cancel() {
    if (!job.value) return
    await $fetch(`/api/jobs/${job.value.id}/cancel`, { method: 'POST' })
    await load()
  }

  // Polling is the browser's business; the server render shows the page without the job.
  onMounted(() => watch(url, load, { immediate: true }))
  onBeforeUnmount(() => { stopped = true; clearTimeout(timer) })
  return { job, error, live, refresh: load, cancel }
}
