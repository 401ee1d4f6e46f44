import { BaseError, ConnectionError, UniqueConstraintError } from 'sequelize'

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

// PostgreSQL codes for a server going away or not yet taking work; class 08 is all connection trouble.
const UNAVAILABLE_CODES = new Set(['57P01', '57P02', '57P03', '53300', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT'])
const UNAVAILABLE_TEXT = /Connection terminated|terminating connection|connection error and is not queryable|the database system is (starting up|shutting down|in recovery mode)/i

type ErrorLike = { name?: string, code?: unknown, message?: string, severity?: unknown, syscall?: string, port?: number, cause?: unknown, parent?: unknown, original?: unknown }

function databasePort(): number {
  try { return Number(new URL(process.env.DATABASE_URL ?? '').port || 5432) }
  catch { return 5432 }
}

/**
 * Whether an error, or anything it wraps, says the database cannot be reached just now (refused, restarting,
 * connections cut), as opposed to a query that is wrong. Such a request is answered 503 so the caller retries.
 * Only errors that come from the database count: S3 or SMTP refusing a connection is not this.
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  const chain: ErrorLike[] = []
  let e = err as ErrorLike | undefined
  while (e && typeof e === 'object' && !chain.includes(e) && chain.length < 10) {
    chain.push(e)
    e = (e.original ?? e.parent ?? e.cause) as ErrorLike | undefined
  }
  if (chain.some(c => c instanceof ConnectionError)) return true
  const fromDb = chain.some(c => c instanceof BaseError || c.severity !== undefined)
  return chain.some((c) => {
    const code = typeof c.code === 'string' ? c.code : ''
    if (c.syscall === 'connect' && c.port === databasePort()) return true
    if (fromDb && (UNAVAILABLE_CODES.has(code) || code.startsWith('08'))) return true
    return (fromDb || c.message === 'Connection terminated unexpectedly') && UNAVAILABLE_TEXT.test(c.message ?? '')
  })
}
