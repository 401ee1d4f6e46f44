import type { H3Error, H3Event } from 'h3'
import { MAX_IMPORT_BYTES } from '#shared/schemas/imports'
import { PHOTO_MAX_BYTES } from '../services/photos'

// Every API body is bounded while it arrives, and, when it claims to be JSON, parsed here once, so an oversized or
// malformed body gets a clear 4xx before any handler runs. The count is of bytes received, so a body without a
// Content-Length (chunked) is stopped at the limit just the same, and the rest of it is never read.
export const JSON_LIMIT_BYTES = 1024 * 1024
/** Room for the multipart framing and the small form fields that travel with the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024
const MB = 1024 * 1024

// Only these routes take files; everywhere else multipart is the wrong kind of body.
const uploadRoutes = [
  { pattern: /^\/api\/coverings\/[^/?]+\/photos\/?(\?|$)/, fileLimit: PHOTO_MAX_BYTES, what: 'the photo' },
  { pattern: /^\/api\/imports\/?(\?|$)/, fileLimit: MAX_IMPORT_BYTES, what: 'the file' },
]

export default defineEventHandler(async (event) => {
  if (!event.path.startsWith('/api/') || !['POST', 'PATCH', 'PUT'].includes(event.method)) return
  const type = (getRequestHeader(event, 'content-type') ?? '').toLowerCase()
  if (type.startsWith('multipart/form-data')) {
    const route = uploadRoutes.find(r => r.pattern.test(event.path))
    if (!route) throw createError({ statusCode: 415, message: 'body: send JSON (application/json), not multipart/form-data', data: { fields: { body: 'wrong content type' } } })
    const refusal = () => createError({ statusCode: 413, message: `file: ${route.what} is larger than ${route.fileLimit / MB} MB`, data: { fields: { file: `larger than ${route.fileLimit / MB} MB` } } })
    const limit = route.fileLimit + FORM_OVERHEAD_BYTES
    if (declaredLength(event) > limit) refuseNow(event, refusal())
    // Read only when the handler asks for the form (after it has checked the session and role), and then under
    // the limit: h3's readRawBody and readMultipartFormData take the body from here.
    event._requestBody = lazily(async () => await readBounded(event, limit, refusal) ?? Buffer.alloc(0)) as unknown as BodyInit
    return
  }
  if (type && !type.startsWith('application/json') && !type.startsWith('text/plain')) {
    throw createError({ statusCode: 415, message: `body: send JSON (application/json), not ${type.split(';')[0]}`, data: { fields: { body: 'wrong content type' } } })
  }
  const refusal = () => createError({ statusCode: 413, message: `body: larger than ${JSON_LIMIT_BYTES / MB} MB`, data: { fields: { body: 'too large' } } })
  if (declaredLength(event) > JSON_LIMIT_BYTES) refuseNow(event, refusal())
  const raw = await readBounded(event, JSON_LIMIT_BYTES, refusal)
  if (raw === undefined) return
  event._requestBody = raw as unknown as BodyInit
  const text = raw.toString('utf8')
  if (text.trim() === '') return
  try {
    JSON.parse(text)
  }
  catch {
    throw createError({ statusCode: 400, message: 'body: is not valid JSON', data: { fields: { body: 'not valid JSON' } } })
  }
})

function declaredLength(event: H3Event) {
  const value = event.node.req.headers['content-length']
  return value === undefined ? 0 : Number(value)
}

/** Answers now and closes the connection after the answer, so the unread body is never taken in. */
function refuseNow(event: H3Event, error: H3Error): never {
  closeAfterAnswer(event)
  throw error
}

/** After a refusal, how long the client has to read the answer before the connection is closed. */
const LINGER_MS = 2000
const lingering = new WeakSet<object>()

/**
 * Node closes a `connection: close` socket as soon as the answer is written; closing while the client is still
 * sending resets the connection, and a reset can make the client lose the answer it has not read yet. So the
 * answer is written and the sending side closed, nothing more is read (the client's writes simply wait), and the
 * socket is closed a moment later.
 */
function closeAfterAnswer(event: H3Event) {
  setResponseHeader(event, 'connection', 'close')
  const socket = event.node.req.socket
  if (lingering.has(socket)) return
  lingering.add(socket)
  socket.destroySoon = () => {
    socket.pause()
    socket.end()
    const timer = setTimeout(() => socket.destroy(), LINGER_MS)
    timer.unref()
    socket.once('close', () => clearTimeout(timer))
  }
}

/** A promise-like that starts its work only when someone first awaits it. */
function lazily<T>(start: () => Promise<T>): PromiseLike<T> {
  let started: Promise<T> | undefined
  return { then: (ok, fail) => (started ??= start()).then(ok, fail) }
}

/**
 * The request body, counted as it arrives: past `limit` bytes reading stops, what was held is dropped and the
 * refusal is returned (the connection closes after the answer). Undefined when there is no body.
 */
function readBounded(event: H3Event, limit: number, refusal: () => H3Error): Promise<Buffer | undefined> {
  const req = event.node.req
  const chunked = /\bchunked\b/i.test(String(req.headers['transfer-encoding'] ?? ''))
  if (!declaredLength(event) && !chunked) return Promise.resolve(undefined)
  if (req.readableEnded) return Promise.resolve(Buffer.alloc(0))
  return new Promise((resolve, reject) => {
    let chunks: Buffer[] = []
    let size = 0
    const stop = () => {
      req.off('data', onData).off('end', onEnd).off('error', onError).off('close', onClose)
    }
    const onData = (chunk: Buffer) => {
      size += chunk.byteLength
      if (size <= limit) {
        chunks.push(chunk)
        return
      }
      stop()
      chunks = []
      req.pause()
      closeAfterAnswer(event)
      reject(refusal())
    }
    const onEnd = () => {
      stop()
      resolve(Buffer.concat(chunks, size))
    }
    const onError = (err: Error) => {
      stop()
      reject(err)
    }
    const onClose = () => {
      stop()
      reject(createError({ statusCode: 400, message: 'body: the request ended before its body was complete', data: { fields: { body: 'incomplete' } } }))
    }
    req.on('data', onData).on('end', onEnd).on('error', onError).on('close', onClose)
  })
}
