// A request that fails because the database cannot be reached (refused, restarting, connections cut) is answered
// at once with 503 and a message a person can act on, rather than an anonymous 500; the pool reconnects by itself
// once PostgreSQL is back, so the next request simply works.
export default defineNitroPlugin((nitroApp) => {
  const handle = nitroApp.h3App.options.onError
  nitroApp.h3App.options.onError = async (error, event) => {
    if (isDatabaseUnavailable(error)) {
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
