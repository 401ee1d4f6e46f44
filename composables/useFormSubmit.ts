import { issueMessages, readApiError } from './useApiError'

/** What the top of a form says when its own check refused some fields. */
export const CHECK_FIELDS = 'Check the fields marked below.'

/**
 * One form's submit state, the same for every form: `pending` while a request is out, `error` for the message at the
 * top, `fields` for the message under each field (the API's `data.fields`, or the form's own zod check through
 * `refuse`), and `success` once the last submit went through. `run(work)` clears them, runs the request and fills
 * them; it returns the request's answer, or undefined when it failed.
 */
export function useFormSubmit() {
  const pending = ref(false)
  const error = ref('')
  const fields = ref<Record<string, string>>({})
  const success = ref(false)

  async function run<T>(work: () => Promise<T>): Promise<T | undefined> {
    pending.value = true
    error.value = ''
    fields.value = {}
    success.value = false
    try {
      const answer = await work()
      success.value = true
      return answer
    }
    catch (err) {
      const read = readApiError(err)
      error.value = read.message
      fields.value = read.fields
      return undefined
    }
    finally {
      pending.value = false
    }
  }

  /** Shows what the form's own check (the server's zod schema, run first in the browser) found, without sending. */
  function refuse(issues: ReadonlyArray<{ path: PropertyKey[], message: string }>, wording?: (field: string, message: string) => string) {
    fields.value = issueMessages(issues, wording)
    error.value = CHECK_FIELDS
    success.value = false
  }

  function reset() {
    error.value = ''
    fields.value = {}
    success.value = false
  }

  return { pending, error, fields, success, run, refuse, reset }
}

export type FormSubmit = ReturnType<typeof useFormSubmit>
