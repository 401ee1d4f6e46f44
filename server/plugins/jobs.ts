import { startJobs, stopJobs } from '../services/jobs'
import { runImport } from '../services/imports'
import { runRecheck } from '../services/rechecks'
import { runExport } from '../services/exports'

// Every server process works the shared job queue (pg-boss in the same PostgreSQL). Stopping the
// server lets running jobs roll back at their next checkpoint, and pg-boss hands them out again.
export default defineNitroPlugin((nitro) => {
  startJobs(useDb(), { import: runImport, recheck: runRecheck, export: runExport }, {
    // Tests see an interrupted job swept within seconds rather than half a minute.
    sweepEverySeconds: process.env.TAUTLINE_TEST === '1' ? 3 : 30,
  })
  nitro.hooks.hook('close', async () => {
    await stopJobs()
  })
})
