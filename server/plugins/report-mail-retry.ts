import { pruneRateLimits } from '../services/rate-limits'
import { retryQueuedReportMails } from '../services/report-dispatch'

/** How often each server process looks for queued report e-mails that are due again (REPORT_RETRY_EVERY_MS). */
const INTERVAL_MS = Number(process.env.REPORT_RETRY_EVERY_MS) > 0 ? Number(process.env.REPORT_RETRY_EVERY_MS) : 30_000

// Every process runs the worker; FOR UPDATE SKIP LOCKED in the claim keeps two from sending one report.
export default defineNitroPlugin((nitro) => {
  let running = false
  const timer = setInterval(async () => {
    // A slow round (SMTP timing out) must not overlap the next one in the same process.
    if (running) return
    running = true
    try {
      const r = await retryQueuedReportMails(useDb())
      // The same timer sweeps rate-limit counters whose window ended a day ago.
      await pruneRateLimits(useDb())
      if (r.claimed) console.info(`[tautline] report e-mail retry: ${r.sent} sent, ${r.queued} queued again, ${r.failed} given up`)
    }
    catch (err) {
      console.error('[tautline] report e-mail retry failed:', (err as Error).message)
    }
    finally {
      running = false
    }
  }, INTERVAL_MS)
  // The timer alone never keeps the process alive.
  timer.unref()
  nitro.hooks.hook('close', () => {
    clearInterval(timer)
  })
})
