import type { H3Event } from 'h3'
import { Photo, Site } from '../models'
import { siteWhere } from '../services/scope'
import { getObject } from '../services/storage'

/** Tenant guard for a photo: its site must be one the user may see (404 otherwise). */
export async function requirePhotoAccess(event: H3Event, id: number): Promise<Photo> {
  const user = await requireUser(event)
  useDb()
  const photo = await Photo.findByPk(id)
  const site = photo && await Site.findOne({ where: { id: photo.siteId, ...siteWhere(user) }, attributes: ['id'] })
  if (!photo || !site) throw createError({ statusCode: 404, message: 'Photo not found' })
  return photo
}

/** Streams an object from the photo store with long-lived caching (keys never change). */
export async function sendStoredObject(event: H3Event, key: string, contentType: string) {
  const object = await getObject(key)
  setResponseHeaders(event, {
    'Content-Type': contentType,
    'Cache-Control': 'private, max-age=31536000, immutable',
    ...(object.length ? { 'Content-Length': String(object.length) } : {}),
  })
  return sendStream(event, object.body)
}
