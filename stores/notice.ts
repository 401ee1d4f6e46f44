import { defineStore } from 'pinia'

export type NoticeTone = 'success' | 'info'

/**
 * A one-line notice meant for one page, which may be the next page (e.g. "Password changed" shown
 * on sign-in after a reset). Browser-side only; it never holds server rows.
 */
export const useNoticeStore = defineStore('notice', () => {
  const text = ref('')
  const tone = ref<NoticeTone>('success')
  const path = ref('')

  function show(message: string, forPath: string, kind: NoticeTone = 'success') {
    text.value = message
    path.value = forPath
    tone.value = kind
  }
  function dismiss() {
    text.value = ''
  }

  return { text, tone, path, show, dismiss }
})
