import { randomUUID, webcrypto } from 'node:crypto'
import exifr from 'exifr'
import { fileTypeFromBuffer } from 'file-type'
import sharp from 'sharp'
import type { Sequelize } from 'sequelize'
import { Photo } from '../models'
import type { Covering } from '../models'
import type { Actor } from './scope'
import { logActivity } from './activity'
import { deleteObject, putObject } from './storage'
import { Refusal } from '../utils/refusal'

export const PHOTO_MAX_BYTES = 15 * 1024 * 1024
/** Decoded size limit: 100 megapixels holds any phone photo (48–64 MP sensors) and keeps a decode's memory bounded. */
export const PHOTO_MAX_PIXELS = 100_000_000
/** A photo that takes longer than this to decode is refused rather than kept waiting. */
const DECODE_SECONDS = 20
/** Photos decoded at once per process; the rest wait their turn, so decoding never takes all of libuv's threads. */
const DECODES_AT_ONCE = 2
/** Largest EXIF block read for the capture time (a JPEG's APP1 segment is at most 64 KB). */
const EXIF_MAX_BYTES = 256 * 1024
/** Capture times before this, or later than the upload plus CLOCK_SLACK_MS, cannot be true and are not kept. */
const EARLIEST_CAPTURE = Date.UTC(1990, 0, 1)
const CLOCK_SLACK_MS = 10 * 60_000

export const photoKinds = ['whole', 'tension_device', 'cleat', 'labels', 'defect'] as const
export type PhotoKind = typeof photoKinds[number]

// Judged by content, never by file name or the browser's claim: the first bytes name the format, then sharp must
// decode the file as that very format.
const accepted: Record<string, { ext: string, format: string, label: string }> = {
  'image/jpeg': { ext: 'jpg', format: 'jpeg', label: 'JPEG file' },
  'image/png': { ext: 'png', format: 'png', label: 'PNG file' },
  'image/webp': { ext: 'webp', format: 'webp', label: 'WebP file' },
  'image/heic': { ext: 'heic', format: 'heif', label: 'HEIC photo' },
  'image/heif': { ext: 'heic', format: 'heif', label: 'HEIC photo' },
}

/** Whether this build of sharp (libvips with libheif) decodes HEVC-coded HEIC, not only AVIF. */
export const heicDecodes = (sharp.format.heif?.input.buffer ?? false) && (sharp.format.heif?.input.fileSuffix ?? []).includes('.heic')
const HEIC_ADVICE = 'send it as JPEG instead: on an iPhone set Settings › Camera › Formats to "Most Compatible", or share the photo as JPEG from the gallery'

export class PhotoRejectedError extends Refusal {
  constructor(statusCode: 413 | 415, message: string) { super(statusCode, 'file', message) }
}

const limits = { failOn: 'error', limitInputPixels: PHOTO_MAX_PIXELS, sequentialRead: true } as const

let decoding = 0
const waiting: (() => void)[] = []
async function inTurn<T>(work: () => Promise<T>): Promise<T> {
  if (decoding >= DECODES_AT_ONCE) await new Promise<void>(resolve => waiting.push(resolve))
  else decoding++
  try {
    return await work()
  }
  finally {
    const next = waiting.shift()
    if (next) next()
    else decoding--
  }
}

const megabytes = (n: number) => `${(n / 1048576).toFixed(1)} MB`
const tooLarge = (data: Uint8Array) => new PhotoRejectedError(413, `file: the photo is ${megabytes(data.byteLength)}; the limit is 15 MB`)
const undecodable = (what: string) => new PhotoRejectedError(415, `file: this ${what} is damaged or incomplete and cannot be shown; send the photo again from the phone's gallery`)

/** The format by the file's first bytes; only a prefix is looked at, so no file can keep the sniffer busy. */
export async function sniffPhoto(data: Uint8Array) {
  if (data.byteLength > PHOTO_MAX_BYTES) throw tooLarge(data)
  const type = await fileTypeFromBuffer(data.subarray(0, 4100))
  const kind = type && accepted[type.mime]
  if (!type || !kind) throw new PhotoRejectedError(415, `file: this is not a JPEG, PNG, WebP or HEIC photo${type ? ` (it is ${type.mime})` : ''}`)
  const mime = type.mime === 'image/heif' ? 'image/heic' : type.mime
  if (mime === 'image/heic' && !heicDecodes) throw new PhotoRejectedError(415, `file: this is a HEIC photo, which Tautline cannot decode; ${HEIC_ADVICE}`)
  return { mime, ext: kind.ext, format: kind.format, label: kind.label }
}

export interface DecodedPhoto { mime: string, ext: string, widthPx: number, heightPx: number, thumb: Buffer, exif: Buffer | null }

/**
 * Decodes the photo with sharp under a pixel limit and a time limit, off the event loop and a few at a time, and
 * makes its thumbnail. A file that does not decode as the format its first bytes claim is refused: nothing
 * undecodable is ever kept as evidence.
 */
export async function decodePhoto(data: Uint8Array): Promise<DecodedPhoto> {
  const { mime, ext, format, label: what } = await sniffPhoto(data)
  return inTurn(async () => {
    let meta: sharp.Metadata
    try {
      // The header only, no pixels: so a huge declared size is refused with its figures.
      meta = await sharp(data, { ...limits, limitInputPixels: false }).metadata()
    }
    catch (err) {
      throw refusal(err, what)
    }
    if (meta.format !== format) throw new PhotoRejectedError(415, `file: this is not a JPEG, PNG, WebP or HEIC photo (it reads as ${meta.format ?? 'unknown'})`)
    const width = meta.autoOrient?.width ?? meta.width
    const height = meta.autoOrient?.height ?? meta.height
    if (!width || !height) throw undecodable(what)
    if (width * height > PHOTO_MAX_PIXELS) throw overPixels(width, height)
    let thumb: Buffer
    try {
      thumb = await sharp(data, limits).rotate().resize(480, 480, { fit: 'inside', withoutEnlargement: true })
        .jpeg({ quality: 78 }).timeout({ seconds: DECODE_SECONDS }).toBuffer()
    }
    catch (err) {
      throw refusal(err, what)
    }
    const exif = meta.exif && meta.exif.byteLength <= EXIF_MAX_BYTES ? meta.exif : null
    return { mime, ext, widthPx: width, heightPx: height, thumb, exif }
  })
}

function overPixels(width: number, height: number) {
  return new PhotoRejectedError(413, `file: the photo is ${width} × ${height} pixels (${(width * height / 1e6).toFixed(0)} megapixels); the limit is ${PHOTO_MAX_PIXELS / 1e6} megapixels`)
}

function refusal(err: unknown, what: string) {
  const message = err instanceof Error ? err.message : ''
  if (/exceeds pixel limit/i.test(message)) return new PhotoRejectedError(413, `file: the photo is larger than ${PHOTO_MAX_PIXELS / 1e6} megapixels`)
  if (/timeout/i.test(message)) return new PhotoRejectedError(415, `file: this ${what} took too long to decode; send it again as an ordinary JPEG`)
  if (what === 'HEIC photo') return new PhotoRejectedError(415, `file: this HEIC photo cannot be decoded; ${HEIC_ADVICE}`)
  return undecodable(what)
}

const EXIF_DATE = /^(\d{4}):(\d{2}):(\d{2})[ T](\d{2}):(\d{2}):(\d{2})/
const EXIF_OFFSET = /^([+-])(\d{2}):(\d{2})$/

/**
 * When the photo was taken, from the EXIF block sharp took out of a file that decoded (never from the whole file).
 * EXIF times are the camera's wall clock; with an OffsetTime tag they are placed exactly, otherwise read as the
 * server's local time. A time that is not a real date, is before 1990 or is later than the upload is not kept.
 */
export async function captureTime(exif: Buffer | null, uploadedAt = new Date()): Promise<Date | null> {
  if (!exif) return null
  const tiff = exif.subarray(0, 6).toString('latin1') === 'Exif\0\0' ? exif.subarray(6) : exif
  let tags: Record<string, unknown> | undefined
  try {
    tags = await exifr.parse(tiff, { reviveValues: false, pick: ['DateTimeOriginal', 'CreateDate', 'OffsetTimeOriginal', 'OffsetTimeDigitized'] }) as Record<string, unknown> | undefined
  }
  catch {
    return null
  }
  const pairs: [unknown, unknown][] = [[tags?.DateTimeOriginal, tags?.OffsetTimeOriginal], [tags?.CreateDate, tags?.OffsetTimeDigitized]]
  for (const [value, offset] of pairs) {
    const when = exifDate(value, offset)
    if (when && when.getTime() >= EARLIEST_CAPTURE && when.getTime() <= uploadedAt.getTime() + CLOCK_SLACK_MS) return when
    if (value !== undefined) return null
  }
  return null
}

function exifDate(value: unknown, offset: unknown): Date | null {
  if (typeof value !== 'string') return null
  const m = EXIF_DATE.exec(value.trim())
  if (!m) return null
  const [year, month, day, hour, minute, second] = m.slice(1).map(Number) as [number, number, number, number, number, number]
  if (month < 1 || month > 12 || day < 1 || day > new Date(Date.UTC(year, month, 0)).getUTCDate() || hour > 23 || minute > 59 || second > 59) return null
  const zone = typeof offset === 'string' ? EXIF_OFFSET.exec(offset.trim()) : null
  if (zone) {
    const sign = zone[1] === '-' ? -1 : 1
    return new Date(Date.UTC(year, month - 1, day, hour, minute, second) - sign * (Number(zone[2]) * 60 + Number(zone[3])) * 60_000)
  }
  return new Date(year, month - 1, day, hour, minute, second)
}

/**
 * Stores a photo as evidence: decodes it under limits (refusing what does not decode), hashes it, uploads original
 * and thumbnail, then writes the row with its decoded size. If any step fails, what was uploaded is removed again.
 */
export async function storePhoto(db: Sequelize, args: { actor: Actor, covering: Covering, kind: PhotoKind, data: Uint8Array, fileName: string | null }) {
  const uploadedAt = new Date()
  const decoded = await decodePhoto(args.data)
  const capturedAt = await captureTime(decoded.exif, uploadedAt)
  // Hashed off the event loop (Web Crypto runs the digest on a worker thread).
  const sha256 = Buffer.from(await webcrypto.subtle.digest('SHA-256', args.data)).toString('hex')
  const base = `w${args.actor.workspaceId}/s${args.covering.siteId}/c${args.covering.id}/${randomUUID()}`
  const objectKey = `${base}.${decoded.ext}`
  const thumbKey = `${base}.thumb.jpg`
  const uploaded: string[] = []
  try {
    await putObject(objectKey, args.data, decoded.mime, sha256)
    uploaded.push(objectKey)
    await putObject(thumbKey, decoded.thumb, 'image/jpeg')
    uploaded.push(thumbKey)
    return await db.transaction(async (transaction) => {
      const photo = await Photo.create({
        workspaceId: args.actor.workspaceId, siteId: args.covering.siteId, coveringId: args.covering.id, kind: args.kind,
        objectKey, thumbKey, contentType: decoded.mime, sizeBytes: args.data.byteLength, sha256, capturedAt,
        uploadedBy: args.actor.id, fileName: args.fileName?.slice(0, 200) ?? null, widthPx: decoded.widthPx, heightPx: decoded.heightPx,
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
