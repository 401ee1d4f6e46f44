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

/** The zod issues a form's own check found, as one message by field (the last issue about a field wins). */
export function issueMessages(issues: ReadonlyArray<{ path: PropertyKey[], message: string }>, wording?: (field: string, message: string) => string): Record<string, string> {
  const out: Record<string, string> = {}
  for (const issue of issues) {
    const field = String(issue.path[0] ?? '')
    out[field] = wording ? wording(field, issue.message) : sentence(issue.message)
  }
  return out
}
