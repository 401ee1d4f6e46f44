import { UniqueConstraintError } from 'sequelize'

/** Runs a write; a unique-key clash becomes a 409 that names the field a person must change. */
export async function uniqueOr409<T>(work: () => Promise<T>, field: string, what: string): Promise<T> {
  try {
    return await work()
  }
  catch (err) {
    if (err instanceof UniqueConstraintError) {
      throw createError({ statusCode: 409, message: `${field}: another ${what} already uses this ${field}`, data: { fields: { [field]: `already used by another ${what}` } } })
    }
    throw err
  }
}
