import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { CHECK_FIELDS, useFormSubmit } from '~/composables/useFormSubmit'

// What $fetch throws for a refused request: the status and the API's JSON body, with per-field messages in data.fields.
function apiError(statusCode: number, data: { statusCode?: number, message?: string, data?: { message?: string, fields?: Record<string, string> } }) {
  return Object.assign(new Error(data.message ?? 'refused'), { statusCode, data })
}

describe('a form submit', () => {
  it('is pending while the request is out, then marks success and hands back the answer', async () => {
    const form = useFormSubmit()
    let finish!: (v: { id: number }) => void
    const answer = form.run(() => new Promise<{ id: number }>((resolve) => { finish = resolve }))
    expect(form.pending.value).toBe(true)
    expect(form.success.value).toBe(false)
    finish({ id: 7 })
    expect(await answer).toEqual({ id: 7 })
    expect(form.pending.value).toBe(false)
    expect(form.success.value).toBe(true)
    expect(form.error.value).toBe('')
  })

  it('puts the API\'s field messages under their fields, capitalised, and its own message at the top', async () => {
    const form = useFormSubmit()
    const answer = await form.run(() => Promise.reject(apiError(400, {
      statusCode: 400, message: 'Invalid body',
      data: { message: 'email is not a valid address', fields: { email: 'email is not a valid address', name: 'name is too long' } },
    })))
    expect(answer).toBeUndefined()
    expect(form.success.value).toBe(false)
    expect(form.pending.value).toBe(false)
    expect(form.error.value).toBe('email is not a valid address')
    expect(form.fields.value).toEqual({ email: 'Email is not a valid address', name: 'Name is too long' })
  })

  it('says the server had a problem on a 5xx, and that it could not reach it when there is no answer', async () => {
    const form = useFormSubmit()
    await form.run(() => Promise.reject(apiError(500, { statusCode: 500, message: 'boom: stack details' })))
    expect(form.error.value).toBe('Tautline had a problem on its side. Try again in a moment.')
    await form.run(() => Promise.reject(new TypeError('fetch failed')))
    expect(form.error.value).toBe('Could not reach Tautline. Check the connection and try again.')
  })

  it('clears the last attempt\'s messages when sent again', async () => {
    const form = useFormSubmit()
    await form.run(() => Promise.reject(apiError(409, { statusCode: 409, message: 'that e-mail is taken', data: { fields: { email: 'already invited' } } })))
    expect(form.fields.value.email).toBe('Already invited')
    await form.run(() => Promise.resolve({ ok: true }))
    expect(form.fields.value).toEqual({})
    expect(form.error.value).toBe('')
    expect(form.success.value).toBe(true)
  })

  it('shows the form\'s own schema check under the fields without sending anything', () => {
    const form = useFormSubmit()
    const parsed = z.object({ name: z.string().min(1, 'name is required'), months: z.number().int().min(1, 'months must be at least 1') })
      .safeParse({ name: '', months: 0 })
    expect(parsed.success).toBe(false)
    if (parsed.success) return
    form.refuse(parsed.error.issues)
    expect(form.error.value).toBe(CHECK_FIELDS)
    expect(form.fields.value).toEqual({ name: 'Name is required', months: 'Months must be at least 1' })
    form.refuse(parsed.error.issues, field => (field === 'months' ? 'Choose how often.' : 'Name the client.'))
    expect(form.fields.value).toEqual({ name: 'Name the client.', months: 'Choose how often.' })
    form.reset()
    expect(form.fields.value).toEqual({})
    expect(form.error.value).toBe('')
  })
})
