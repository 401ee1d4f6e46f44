import type { H3Event } from 'h3'
import { ImportFile, Job } from '../models'
import type { JobKind } from '../models'
import { seesClient } from '../services/scope'

const nouns: Record<JobKind, string> = { import: 'Import', recheck: 'Re-check', export: 'Export' }

/**
 * Tenant guard for a background job: it must be of the kind asked for, in the user's workspace, and
 * for a property manager about their own client. Anything else answers 404.
 */
export async function requireJobAccess(event: H3Event, id: number, kind?: JobKind): Promise<Job> {
  const user = await requireUser(event)
  useDb()
  const job = await Job.findOne({ where: { id, workspaceId: user.workspaceId, ...(kind ? { kind } : {}) } })
  if (!job || !seesClient(user, job.clientId)) {
    throw createError({ statusCode: 404, message: `${kind ? nouns[kind] : 'Job'} not found` })
  }
  return job
}

export async function requireImportAccess(event: H3Event, id: number): Promise<{ job: Job, file: ImportFile }> {
  const job = await requireJobAccess(event, id, 'import')
  return { job, file: (await ImportFile.findByPk(job.id))! }
}
