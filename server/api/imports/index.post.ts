import { canOversee } from '#shared/access'
import { importFormSchema } from '#shared/schemas/imports'
import { createImport, getImport, importClient } from '../../services/imports'

// multipart/form-data: `file` (the CSV), `mode` (dry-run or commit), `skipInvalid`, and for staff `clientId`.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canOversee)
  // The body guard counts the bytes as they arrive and refuses past 32 MB (413 naming `file`) before all are read.
  const parts = await readMultipartFormData(event).catch((err: unknown) => {
    if (isError(err)) throw err
    return null
  })
  if (!parts) throw createError({ statusCode: 400, message: 'file: send the CSV as multipart/form-data with a `file` part', data: { fields: { file: 'missing' } } })
  const form = validateFields(importFormSchema, Object.fromEntries(parts.filter(p => p.filename === undefined && p.name).map(p => [p.name!, p.data.toString('utf8')])))
  const file = parts.find(p => p.name === 'file' && p.filename !== undefined)
  if (!file?.data.byteLength) throw createError({ statusCode: 400, message: 'file: no file was attached', data: { fields: { file: 'missing' } } })
  // Staff choose the client; a manager imports into their own, and naming another is not found.
  if (form.clientId !== undefined) await requireClientAccess(event, form.clientId)
  const client = await importClient(user, form.clientId)
  const job = await createImport(useDb(), user, { client, fileName: (file.filename || 'import.csv').slice(0, 200), data: file.data,
    mode: form.mode === 'commit' ? 'commit' : 'dry_run', skipInvalid: form.skipInvalid })
  setResponseStatus(event, 202)
  return getImport(useDb(), job)
})
