import { DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3'
import type { Readable } from 'node:stream'
import { Refusal } from '../utils/refusal'

// Photos and thumbnails live in one S3 bucket (s3rver locally). Keys are made by the server only.
let client: S3Client | undefined

export function bucket(): string {
  const b = process.env.S3_BUCKET
  if (!b) throw new Error('S3_BUCKET is not set')
  return b
}

export function s3(): S3Client {
  client ??= new S3Client({
    endpoint: process.env.S3_ENDPOINT,
    region: process.env.S3_REGION ?? 'us-east-1',
    forcePathStyle: process.env.S3_FORCE_PATH_STYLE === '1',
    credentials: process.env.S3_ACCESS_KEY_ID
      ? { accessKeyId: process.env.S3_ACCESS_KEY_ID, secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? '' }
      : undefined,
    // Fail fast when the store is down rather than hold the installer's request open.
    requestHandler: { requestTimeout: 15_000, connectionTimeout: 3_000 },
    maxAttempts: 2,
  })
  return client
}

/** The one answer when the S3 store cannot be reached: nothing was saved or sent, and trying again will work. */
export const STORAGE_UNAVAILABLE = 'Photo storage is unreachable just now; nothing was saved or sent. Try again in a moment.'

export class StorageUnavailableError extends Refusal {
  /** The S3 client's own code (ECONNREFUSED, TimeoutError…), kept for the logs and retry records. */
  readonly code: string
  constructor(cause: unknown) {
    super(503, null, STORAGE_UNAVAILABLE, {}, cause)
    const e = cause as { code?: string, name?: string }
    this.code = e?.code ?? e?.name ?? 'error'
  }
}

/** An object the register points at is not in the store: the record is kept, and a backup can bring the file back. */
export class StoredObjectMissingError extends Refusal {
  constructor(readonly key: string) {
    super(404, null, 'The stored file is missing from storage; its record is kept. An administrator can restore it from a backup.')
  }
}

async function guarded<T>(work: () => Promise<T>, key?: string): Promise<T> {
  try {
    return await work()
  }
  catch (err) {
    const e = err as { name?: string, code?: string, $metadata?: { httpStatusCode?: number } }
    if (e.name === 'NoSuchKey' || e.$metadata?.httpStatusCode === 404) throw key ? new StoredObjectMissingError(key) : err
    throw new StorageUnavailableError(err)
  }
}

export function putObject(key: string, body: Uint8Array, contentType: string, sha256Hex?: string) {
  return guarded(() => s3().send(new PutObjectCommand({
    Bucket: bucket(), Key: key, Body: body, ContentType: contentType,
    Metadata: sha256Hex ? { sha256: sha256Hex } : undefined,
  })))
}

export async function getObject(key: string): Promise<{ body: Readable, contentType?: string, length?: number }> {
  const r = await guarded(() => s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key })), key)
  return { body: r.Body as Readable, contentType: r.ContentType, length: r.ContentLength }
}

export async function getObjectBytes(key: string): Promise<Uint8Array> {
  const r = await guarded(() => s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key })), key)
  return r.Body!.transformToByteArray()
}

export function deleteObject(key: string) {
  return guarded(() => s3().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key })))
}

export async function storageReachable() {
  try {
    await s3().send(new HeadBucketCommand({ Bucket: bucket() }))
    return true
  }
  catch {
    return false
  }
}
