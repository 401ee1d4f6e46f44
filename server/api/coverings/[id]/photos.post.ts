import { canFit } from '#shared/access'
import { z } from 'zod'
import { idParamsSchema } from '#shared/schemas/common'
import { Covering } from '../../../models'
import { photoJson, photoKinds, storePhoto } from '../../../services/photos'

const kindSchema = z.enum(photoKinds, { error: `kind must be one of ${photoKinds.join(', ')}` })

// multipart/form-data with `file` (the photo) and `kind`.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record: covering } = await requireInSite(event, Covering, id)
  // The body guard counts the bytes as they arrive and refuses past 15 MB (413 naming `file`) before all are read.
  const parts = await readMultipartFormData(event).catch((err: unknown) => {
    if (isError(err)) throw err
    return null
  })
  if (!parts) throw createError({ statusCode: 400, message: 'file: send the photo as multipart/form-data with a `file` part', data: { fields: { file: 'missing' } } })
  const file = parts.find(p => p.name === 'file' && p.filename !== undefined)
  if (!file?.data.byteLength) throw createError({ statusCode: 400, message: 'file: no photo was attached', data: { fields: { file: 'missing' } } })
  const kind = kindSchema.safeParse(parts.find(p => p.name === 'kind')?.data.toString('utf8'))
  if (!kind.success) throw createError({ statusCode: 400, message: `kind: ${kind.error.issues[0]!.message}`, data: { fields: { kind: kind.error.issues[0]!.message } } })
  const photo = await storePhoto(useDb(), { actor: user, covering, kind: kind.data, data: file.data, fileName: file.filename ?? null })
  setResponseStatus(event, 201)
  return photoJson(photo)
})
