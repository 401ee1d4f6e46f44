import { Refusal } from '../utils/refusal'

// The one place errors become answers. A Refusal from a service (field, message, status) is answered in the
// API's shape: the status, the message naming the field, and `data.fields` for the form. A request that fails
// because the database cannot be reached (refused, restarting, connections cut) is answered at once with 503 and
// a message a person can act on, rather than an anonymous 500; the pool reconnects by itself once PostgreSQL is
// back, so the next request simply works.
export default defineNitroPlugin((nitroApp) => {
  const handle = nitroApp.h3App.options.onError
  nitroApp.h3App.options.onError = async (error, event) => {
    const refused = refusalIn(error)
    if (refused) {
      Object.assign(error, {
        statusCode: refused.statusCode, unhandled: false, message: refused.message,
        data: refused.field ? { fields: refused.fields } : undefined,
      })
      setResponseStatus(event, refused.statusCode)
      if (refused.statusCode === 503) setResponseHeader(event, 'Retry-After', 2)
    }
    else if (isDatabaseUnavailable(error)) {
      Object.assign(error, {
        statusCode: 503, statusMessage: 'Service Unavailable', unhandled: false,
        message: 'The register\'s database is unreachable just now; try again in a moment.',
      })
      setResponseStatus(event, 503, 'Service Unavailable')
      setResponseHeader(event, 'Retry-After', 2)
    }
    return handle?.(error, event)
  }
})

/** h3 wraps what a handler throws; the Refusal is the error itself or its cause. */
function refusalIn(error: { cause?: unknown }): Refusal | null {
  if (error instanceof Refusal) return error
  return error.cause instanceof Refusal ? error.cause : null
}
