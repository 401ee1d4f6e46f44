import type { H3Event } from 'h3'
import { mailReachable } from '../services/mail'
import { storageReachable } from '../services/storage'
import { verifyEvidence } from '../services/evidence-chain'

// Public health check for load balancers: whether the database, photo storage and mail relay
// answer. It says nothing secret (no addresses, no versions) and answers 503 when one is down.
// A signed-in admin also gets the tamper-evidence line for their own workspace: the chain recomputed
// and the first row that no longer matches. Anyone else sees no chain detail at all.
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

/** The signed-in admin, if that is who asks; never an error (the check stays public). */
async function adminAsking(event: H3Event) {
  const session = await getUserSession(event)
  if (!session.user) return null
  const user = await requireUser(event).catch(() => null)
  return user?.role === 'admin' ? user : null
}

const CHAIN_TIMEOUT_MS = 20_000

async function evidenceLine(workspaceId: number) {
  try {
    const report = await verifyEvidence(useDb(), { workspaceId, timeoutMs: CHAIN_TIMEOUT_MS })
    return { status: report.intact ? 'intact' as const : 'broken' as const, rows: report.rows, firstBreak: report.firstBreak }
  }
  catch {
    return { status: 'unknown' as const, rows: null, firstBreak: null, message: 'The chain could not be recomputed just now; run `npm run verify` on the server.' }
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
  const admin = database === 'up' ? await adminAsking(event) : null
  const evidence = admin ? await evidenceLine(admin.workspaceId) : undefined
  if (!ok) setResponseStatus(event, 503)
  return { status: ok ? 'ok' : 'degraded', database, storage, mail, ...(evidence ? { evidence } : {}), tookMs: Date.now() - started }
})
