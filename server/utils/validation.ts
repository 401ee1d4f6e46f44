import type { ZodType } from 'zod'

/**
 * A validator for h3's readValidatedBody / getValidatedQuery / getValidatedRouterParams.
 * A failure becomes a 400 whose message names the first bad field and whose data lists every field.
 */
export function validateWith<T>(schema: ZodType<T>) {
  return (input: unknown): T => {
    // No body at all reads as an empty object; a body of JSON null is a body, and not an object.
    const result = schema.safeParse(input === undefined ? {} : input)
    if (result.success) return result.data
    const fields: Record<string, string> = {}
    for (const issue of result.error.issues) {
      const path = issue.path.map(String).join('.') || 'body'
      // A body that is not an object at all has no field to blame; say what it must be.
      fields[path] ??= path === 'body' && issue.code === 'invalid_type' ? 'must be a JSON object' : issue.message
    }
    const [first] = Object.entries(fields)
    // h3 turns a thrown value into a 400 "Validation Error" with it as data.
    throw { message: first ? (first[1].startsWith(first[0]) ? first[1] : `${first[0]}: ${first[1]}`) : 'invalid input', fields }
  }
}
