import { createHash, randomUUID } from 'node:crypto'
import exifr from 'exifr'
import { fileTypeFromBuffer } from 'file-type'
import sharp from 'sharp'
import type { Sequelize } from 'sequelize'
import { Photo } from '../models'
import type { Covering } from '../models'
import type { Actor } from './scope'
import { logActivity } from './activity'
import { deleteObject, putObject } from './storage'

export const PHOTO_MAX_BYTES = 15 * 1024 * 1024
export const photoKinds = ['whole', 'tension_device', 'cleat', 'labels', 'defect'] as const
export type PhotoKind = typeof photoKinds[number]

// Judged by content, never by file name or the browser's claim.
const accepted: Record<string, string> = { 'image/jpeg': 'jpg', 'image/png': 'png', 'image/webp': 'webp', 'image/heic': 'heic', 'image/heif': 'heic' }

export class PhotoRejectedError extends Error {
  constructor(readonly statusCode: 413 | 415, message: string) { super(message) }
}

export async function sniffPhoto(data: Uint8Array) {
  if (data.byteLength > PHOTO_MAX_BYTES) throw new PhotoRejectedError(413, `file: the photo is ${(data.byteLength / 1048576).toFixed(1)} MB; the limit is 15 MB`)
  const type = await fileTypeFromBuffer(data)
  const ext = type && accepted[type.mime]
  if (!type || !ext) throw new PhotoRejectedError(415, `file: this is not a JPEG, PNG, WebP or HEIC photo${type ? ` (it is ${type.mime})` : ''}`)
  return { mime: type.mime === 'image/heif' ? 'image/heic' : type.mime, ext }
}

async function captureTime(data: Uint8Array): Promise<Date | null> {
  try {
    const tags = await exifr.parse(Buffer.from(data), { pick: ['DateTimeOriginal', 'CreateDate'] }) as { DateTimeOriginal?: Date, CreateDate?: Date } | undefined
    const when = tags?.DateTimeOriginal ?? tags?.CreateDate
    return when instanceof Date && !Number.isNaN(when.getTime()) ? when : null
  }
  catch {
    return null
  }
}

async function thumbnail(data: Uint8Array) {
  try {
    const image = sharp(data, { failOn: 'error' }).rotate()
    const meta = await image.metadata()
    const thumb = await image.resize(480, 480, { fit: 'inside', withoutEnlargement: true }).jpeg({ quality: 78 }).toBuffer()
    return { thumb, widthPx: meta.autoOrient?.width ?? meta.width ?? null, heightPx: meta.autoOrient?.height ?? meta.height ?? null }
  }
  catch {
    // HEIC and damaged files keep no thumbnail; the original is still kept as evidence.
    return { thumb: null, widthPx: null, heightPx: null }
  }
}

/**
 * Stores a photo as evidence: checks the content, hashes it, uploads original and thumbnail,
 * then writes the row. If any step fails, what was already uploaded is removed again.
 */
export async function storePhoto(db: Sequelize, args: { actor: Actor, covering: Covering, kind: PhotoKind, data: Uint8Array, fileName: string | null }) {
  const { mime, ext } = await sniffPhoto(args.data)
  const sha256 = createHash('sha256').update(args.data).digest('hex')
  const [capturedAt, thumb] = await Promise.all([captureTime(args.data), thumbnail(args.data)])
  const base = `w${args.actor.workspaceId}/s${args.covering.siteId}/c${args.covering.id}/${randomUUID()}`
  const objectKey = `${base}.${ext}`
  const thumbKey = thumb.thumb ? `${base}.thumb.jpg` : null
  const uploaded: string[] = []
  try {
    await putObject(objectKey, args.data, mime, sha256)
    uploaded.push(objectKey)
    if (thumbKey && thumb.thumb) {
      await putObject(thumbKey, thumb.thumb, 'image/jpeg')
      uploaded.push(thumbKey)
    }
    return await db.transaction(async (transaction) => {
      const photo = await Photo.create({
        workspaceId: args.actor.workspaceId, siteId: args.covering.siteId, coveringId: args.covering.id, kind: args.kind,
        objectKey, thumbKey, contentType: mime, sizeBytes: args.data.byteLength, sha256, capturedAt,
        uploadedBy: args.actor.id, fileName: args.fileName?.slice(0, 200) ?? null, widthPx: thumb.widthPx, heightPx: thumb.heightPx,
      }, { transaction })
      await logActivity({ workspaceId: args.actor.workspaceId, userId: args.actor.id, action: 'photo.added', entity: 'covering', entityId: args.covering.id,
        detail: { photoId: photo.id, kind: args.kind, sha256 } }, transaction)
      return photo
    })
  }
  catch (err) {
    await Promise.allSettled(uploaded.map(k => deleteObject(k)))
    throw err
  }
}

export function photoJson(p: Photo) {
  return {
    id: p.id, coveringId: p.coveringId, kind: p.kind, contentType: p.contentType, sizeBytes: p.sizeBytes, sha256: p.sha256,
    capturedAt: p.capturedAt, uploadedBy: p.uploadedBy, fileName: p.fileName, widthPx: p.widthPx, heightPx: p.heightPx,
    createdAt: p.createdAt, url: `/api/photos/${p.id}`, thumbUrl: p.thumbKey ? `/api/photos/${p.id}/thumb` : null,
  }
}
