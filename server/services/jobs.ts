import PgBoss from 'pg-boss'
import { QueryTypes } from 'sequelize'
import type { Sequelize, Transaction } from 'sequelize'
import { databaseUrl } from '../db'
import { Job } from '../models'
import type { JobKind } from '../models'
import type { JobSummary } from '../../shared/types/jobs'

// Background jobs: our `jobs` table is what pages read (status, progress, counts, cancel); pg-boss, in
// the same PostgreSQL, hands each job to one server process and retries it when a process dies.

/** The person asked to cancel: the handler rolls back and the job ends `cancelled`. */
export class JobCancelled extends Error {}
/** This process is stopping: the handler rolls back and pg-boss hands the job out again. */
export class JobInterrupted extends Error {}
/** A final failure with a message a person can act on; never retried. */
export class JobFailed extends Error {}

export interface JobContext {
  job: Job
  /** Saves progress and beats the heartbeat; between batches it throws JobCancelled or JobInterrupted. */
  checkpoint(done: number, counts?: Record<string, unknown>, total?: number): Promise<void>
}
/** Does the work and returns the final counts. */
export type JobHandler = (db: Sequelize, ctx: JobContext) => Promise<Record<string, unknown>>

export const MAX_ATTEMPTS = 3
const HEARTBEAT_MS = 5_000
/** A running job whose heartbeat is older than this lost its process. */
export const STALE_AFTER_SECONDS = 60
const queueOf = (kind: JobKind) => `tautline-${kind}`

let stopping = false
let boss: PgBoss | undefined
let ready: Promise<PgBoss> | undefined
const workerIds = new Map<JobKind, string>()

async function finish(db: Sequelize, id: number, status: 'succeeded' | 'failed' | 'cancelled', fields: { counts?: Record<string, unknown>, error?: string | null }) {
  await db.query(`UPDATE jobs SET status = :status, counts = COALESCE(CAST(:counts AS jsonb), counts), error = :error,
      finished_at = now(), heartbeat_at = now(), updated_at = now() WHERE id = :id`,
  { replacements: { id, status, counts: fields.counts ? JSON.stringify(fields.counts) : null, error: fields.error ?? null } })
}

/** Runs one job to its end in this process; rethrows only when pg-boss should hand it out again. */
export async function runJob(db: Sequelize, jobId: number, handler: JobHandler): Promise<void> {
  const [claimed] = await db.query<{ id: number }>(`UPDATE jobs SET status = 'running', attempts = attempts + 1, started_at = COALESCE(started_at, now()),
      heartbeat_at = now(), updated_at = now() WHERE id = :jobId AND status IN ('queued', 'running') RETURNING id`, { type: QueryTypes.SELECT, replacements: { jobId } })
  if (!claimed) return
  const job = (await Job.findByPk(jobId))!
  if (job.cancelRequested) return finish(db, jobId, 'cancelled', { error: 'Cancelled before it started; nothing was written.' })
  let cancelSeen = false
  const beat = setInterval(() => {
    db.query<{ cancel: boolean }>('UPDATE jobs SET heartbeat_at = now() WHERE id = :jobId RETURNING cancel_requested AS cancel', { type: QueryTypes.SELECT, replacements: { jobId } })
      .then(([r]) => { cancelSeen ||= r?.cancel === true })
      .catch(() => { /* the next checkpoint reports a lost database */ })
  }, HEARTBEAT_MS)
  beat.unref()
  const ctx: JobContext = {
    job,
    async checkpoint(done, counts, total) {
      const [r] = await db.query<{ cancel: boolean }>(`UPDATE jobs SET progress_done = :done, progress_total = COALESCE(:total, progress_total),
          counts = COALESCE(CAST(:counts AS jsonb), counts), heartbeat_at = now(), updated_at = now() WHERE id = :jobId RETURNING cancel_requested AS cancel`,
      { type: QueryTypes.SELECT, replacements: { jobId, done, total: total ?? null, counts: counts ? JSON.stringify(counts) : null } })
      if (r?.cancel || cancelSeen) throw new JobCancelled('Cancelled; nothing was written.')
      if (stopping) throw new JobInterrupted('a server stopped while this ran')
    },
  }
  try {
    const counts = await handler(db, ctx)
    await finish(db, jobId, 'succeeded', { counts })
  }
  catch (err) {
    if (err instanceof JobCancelled) return finish(db, jobId, 'cancelled', { error: err.message })
    if (err instanceof JobFailed) return finish(db, jobId, 'failed', { error: err.message })
    const why = err instanceof JobInterrupted ? err.message : (err as Error).message
    if (job.attempts + 1 >= MAX_ATTEMPTS) {
      console.error(`[tautline] job ${jobId} (${job.kind}) gave up:`, err)
      return finish(db, jobId, 'failed', { error: `Stopped after ${MAX_ATTEMPTS} attempts (${why}); nothing from the last attempt was kept. Start it again.` })
    }
    await db.query(`UPDATE jobs SET status = 'queued', error = :error, progress_done = 0, updated_at = now() WHERE id = :jobId`,
      { replacements: { jobId, error: `Interrupted (${why}); it starts again by itself.` } })
    throw err
  }
  finally {
    clearInterval(beat)
  }
}

/** Starts pg-boss and one worker per kind in this process; safe to call once per process. */
export function startJobs(db: Sequelize, handlers: Record<JobKind, JobHandler>, options: { sweepEverySeconds?: number } = {}) {
  if (ready) return ready
  stopping = false
  ready = (async () => {
    const b = new PgBoss({ connectionString: databaseUrl(), schema: 'pgboss', max: 4, application_name: 'tautline-jobs' })
    b.on('error', err => console.error('[tautline] job queue:', err.message))
    await b.start()
    boss = b
    for (const kind of Object.keys(handlers) as JobKind[]) {
      const name = queueOf(kind)
      await b.createQueue(name, { name, retryLimit: MAX_ATTEMPTS - 1, retryDelay: 2, expireInSeconds: 3600 })
      const workerId = await b.work<{ jobId: number }>(name, { pollingIntervalSeconds: 1, batchSize: 1 }, async ([job]) => {
        if (job) await runJob(db, job.data.jobId, handlers[kind])
      })
      workerIds.set(kind, workerId)
    }
    const sweep = () => sweepStaleJobs(db).catch(err => console.error('[tautline] job sweep:', (err as Error).message))
    await sweep()
    const timer = setInterval(sweep, (options.sweepEverySeconds ?? 30) * 1000)
    timer.unref()
    b.on('stopped', () => clearInterval(timer))
    return b
  })()
  ready.catch(err => console.error('[tautline] the job queue did not start:', (err as Error).message))
  return ready
}

/** Lets running jobs roll back at their next checkpoint, then stops pg-boss (which hands their work out again). */
export async function stopJobs() {
  stopping = true
  const b = await ready?.catch(() => undefined)
  ready = undefined
  boss = undefined
  await b?.stop({ graceful: true, timeout: 15_000, close: true })
}

/** Creates the job row and hands it to the queue; a job that cannot be queued ends failed at once. */
export async function enqueueJob(db: Sequelize, job: Job) {
  try {
    if (!ready) throw new Error('the job queue is not running in this process')
    const b = await ready
    const queueJobId = await b.send(queueOf(job.kind), { jobId: job.id }, { retryLimit: MAX_ATTEMPTS - 1, retryDelay: 2, expireInSeconds: 3600 })
    await job.update({ queueJobId })
    const worker = workerIds.get(job.kind)
    if (worker) b.notifyWorker(worker)
  }
  catch (err) {
    await finish(db, job.id, 'failed', { error: 'Could not be queued; try again in a moment.' })
    throw err
  }
}

interface NewJob {
  workspaceId: number
  /** The client whose data the job touches; null for the whole workspace. */
  clientId: number | null
  siteId?: number | null
  kind: JobKind
  params: Record<string, unknown>
  createdBy: number
  progressTotal?: number | null
}

export function createJob(args: NewJob, transaction?: Transaction) {
  return Job.create({ ...args, siteId: args.siteId ?? null, progressTotal: args.progressTotal ?? null }, { transaction })
}

/** Cancel: a queued job ends at once; a running one rolls back at its next checkpoint. */
export async function requestCancel(db: Sequelize, job: Job) {
  await db.query(`UPDATE jobs SET cancel_requested = true, updated_at = now() WHERE id = :id AND status IN ('queued','running')`, { replacements: { id: job.id } })
  const [ended] = await db.query<{ id: number }>(`UPDATE jobs SET status = 'cancelled', error = 'Cancelled before it started; nothing was written.', finished_at = now(), updated_at = now()
    WHERE id = :id AND status = 'queued' AND attempts = 0 RETURNING id`, { type: QueryTypes.SELECT, replacements: { id: job.id } })
  if (ended && job.queueJobId && boss) await boss.cancel(queueOf(job.kind), job.queueJobId).catch(() => undefined)
  await job.reload()
}

/**
 * A job never stays "running" after its process died: a stale heartbeat hands it back to pg-boss
 * (which starts it again while attempts remain) or ends it failed with a message.
 */
export async function sweepStaleJobs(db: Sequelize) {
  const b = boss
  if (!b) return
  const stale = await db.query<{ id: number, kind: JobKind, status: string, queueJobId: string | null }>(`SELECT id, kind, status, queue_job_id AS "queueJobId" FROM jobs
    WHERE (status = 'running' AND heartbeat_at < now() - make_interval(secs => :stale))
       OR (status = 'queued' AND updated_at < now() - make_interval(secs => :stale)) LIMIT 100`,
  { type: QueryTypes.SELECT, replacements: { stale: STALE_AFTER_SECONDS } })
  for (const job of stale) {
    const name = queueOf(job.kind)
    let queued = job.queueJobId ? await b.getJobById(name, job.queueJobId) : null
    if (queued?.state === 'active' && job.status === 'running') {
      await b.fail(name, job.queueJobId!, { message: 'the process running it stopped' })
      queued = await b.getJobById(name, job.queueJobId!)
    }
    if (queued && ['created', 'retry', 'active'].includes(queued.state)) {
      if (job.status === 'running') {
        await db.query(`UPDATE jobs SET status = 'queued', error = 'Interrupted when a server stopped; it starts again by itself.', updated_at = now() WHERE id = :id AND status = 'running'`,
          { replacements: { id: job.id } })
      }
      continue
    }
    await db.query(`UPDATE jobs SET status = 'failed', finished_at = now(), updated_at = now(),
        error = 'Interrupted when a server stopped, and it could not be resumed; nothing from it was kept. Start it again.'
      WHERE id = :id AND status IN ('queued','running')`, { replacements: { id: job.id } })
  }
}

export function jobJson(job: Job, extra: { createdByName?: string | null } = {}): JobSummary {
  const total = job.progressTotal
  return {
    id: job.id,
    kind: job.kind,
    status: job.status,
    progress: { done: job.progressDone, total, percent: total ? Math.min(100, Math.round((job.progressDone / total) * 100)) : job.status === 'succeeded' ? 100 : 0 },
    counts: job.counts,
    error: job.error,
    cancelRequested: job.cancelRequested,
    clientId: job.clientId,
    siteId: job.siteId,
    createdByName: extra.createdByName ?? null,
    createdAt: job.createdAt.toISOString(),
    startedAt: job.startedAt?.toISOString() ?? null,
    finishedAt: job.finishedAt?.toISOString() ?? null,
  }
}
