import { mailReachable } from '../services/mail'
import { storageReachable } from '../services/storage'

// Public health check for load balancers: whether the database, photo storage and mail relay
// answer. It says nothing secret (no addresses, no versions) and answers 503 when one is down.
async function timed(check: () => Promise<unknown>, ms = 2000): Promise<'up' | 'down'> {
  let timer: NodeJS.Timeout | undefined
  try {
    const ok = await Promise.race([check(), new Promise((resolve) => { timer = setTimeout(() => resolve(false), ms) })])
    return ok === false ? 'down' : 'up'
  }
  catch {
    return 'down'
  }
  finally {
    clearTimeout(timer)
  }
}

export default defineEventHandler(async (event) => {
  const started = Date.now()
  const [database, storage, mail] = await Promise.all([
    timed(() => useDb().query('SELECT 1')),
    timed(() => storageReachable()),
    timed(() => mailReachable()),
  ])
  const ok = database === 'up' && storage === 'up' && mail === 'up'
  if (!ok) setResponseStatus(event, 503)
  return { status: ok ? 'ok' : 'degraded', database, storage, mail, tookMs: Date.now() - started }
})
