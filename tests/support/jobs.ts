import { stringify } from 'csv-stringify/sync'
import type { ApiClient } from './api'

// Import files and background jobs for the API and browser tests.

/** A CSV with the given header and rows; a row is a map of column to cell (missing cells are empty). */
export function csvOf(header: string[], rows: Array<Record<string, string | number | undefined>>) {
  return stringify([header, ...rows.map(r => header.map(h => (r[h] === undefined ? '' : String(r[h]))))])
}

export async function upload(client: ApiClient, csv: string, fields: { mode?: 'dry-run' | 'commit', skipInvalid?: boolean, clientId?: number } = {}, fileName = 'units.csv') {
  const form = new FormData()
  if (fields.mode) form.append('mode', fields.mode)
  if (fields.skipInvalid !== undefined) form.append('skipInvalid', String(fields.skipInvalid))
  if (fields.clientId !== undefined) form.append('clientId', String(fields.clientId))
  form.append('file', new Blob([csv], { type: 'text/csv' }), fileName)
  return client.request('POST', '/api/imports', form)
}

/** Polls a job's route until it has ended (succeeded, failed or cancelled). */
export async function settled(client: ApiClient, path: string, ms = 60_000) {
  const until = Date.now() + ms
  for (;;) {
    const r = await client.get(path)
    if (r.status !== 200) throw new Error(`${path}: ${r.status} ${JSON.stringify(r.body)}`)
    if (['succeeded', 'failed', 'cancelled'].includes(r.body.status)) return r.body
    if (Date.now() > until) throw new Error(`${path} still ${r.body.status} after ${ms} ms`)
    await new Promise(res => setTimeout(res, 150))
  }
}

/** Uploads and waits for the import to end. */
export async function importFile(client: ApiClient, csv: string, fields: Parameters<typeof upload>[2] = {}) {
  const r = await upload(client, csv, fields)
  if (r.status !== 202) throw new Error(`import refused: ${r.status} ${JSON.stringify(r.body)}`)
  return settled(client, `/api/imports/${r.body.id}`)
}
