import type { FetchError } from 'ofetch'

/** Server messages start in lower case ("email is not a valid address"); shown alone they read better capitalised. */
export function sentence(text: string): string {
  return text ? text.charAt(0).toUpperCase() + text.slice(1) : text
}

interface ApiErrorBody { statusCode?: number, message?: string, data?: { message?: string, fields?: Record<string, string> } }

/**
 * Reads an API error: a message for a person and the per-field messages in `data.fields`.
 * A validation failure carries its own message under `data`, so that one wins.
 */
export function readApiError(err: unknown): { status: number, message: string, fields: Record<string, string> } {
  const e = err as Partial<FetchError<ApiErrorBody>> | null
  const body = e?.data
  const status = e?.statusCode ?? body?.statusCode ?? 0
  const fields = Object.fromEntries(Object.entries(body?.data?.fields ?? {}).map(([k, v]) => [k, sentence(v)]))
  let message = body?.data?.message ?? body?.message ?? e?.message ?? 'Something went wrong.'
  if (status === 0 || !body) message = 'Could not reach Tautline. Check the connection and try again.'
  if (status >= 500) message = 'Tautline had a problem on its side. Try again in a moment.'
  return { status, message, fields }
}

/** A form's submit state: busy flag, top message and field errors, with a runner that fills them. */
export function useFormState() {
  const busy = ref(false)
  const message = ref('')
  const fields = ref<Record<string, string>>({})

  async function run<T>(work: () => Promise<T>): Promise<T | undefined> {
    busy.value = true
    message.value = ''
    fields.value = {}
    try {
      return await work()
    }
    catch (err) {
      const read = readApiError(err)
      message.value = read.message
      fields.value = read.fields
      return undefined
    }
    finally {
      busy.value = false
    }
  }

  return { busy, message, fields, run }
}
