// Public liveness check: says whether the database answers, and nothing secret.
export default defineEventHandler(async (event) => {
  const started = Date.now()
  let database: 'up' | 'down' = 'up'
  try {
    await useDb().query('SELECT 1')
  }
  catch {
    database = 'down'
  }
  if (database === 'down') setResponseStatus(event, 503)
  return { status: database === 'up' ? 'ok' : 'degraded', database, tookMs: Date.now() - started }
})
