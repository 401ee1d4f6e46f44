import type { ZodType } from 'zod'

/** validateWith for values read by hand (multipart form fields): a failure is the same 400 a bad body gets. */
export function validateFields<T>(schema: ZodType<T>, input: Record<string, unknown>): T {
  try {
    return validateWith(schema)(input)
  }
  catch (err) {
    const e = err as { message: string, fields: Record<string, string> }
    throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: e.message, data: e })
  }
}
