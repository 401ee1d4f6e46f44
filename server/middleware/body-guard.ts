// Every API body is bounded and, when it claims to be JSON, parsed here once, so a malformed or
// oversized body gets a clear 4xx naming `body` before any handler runs.
const JSON_LIMIT_BYTES = 1024 * 1024
const UPLOAD_LIMIT_BYTES = 16 * 1024 * 1024 + 256 * 1024
// Only these routes take files; everywhere else multipart is the wrong kind of body.
const UPLOAD_ROUTES = /^\/api\/(coverings\/[^/]+\/photos|imports)\/?(\?|$)/

export default defineEventHandler(async (event) => {
  if (!event.path.startsWith('/api/') || !['POST', 'PATCH', 'PUT'].includes(event.method)) return
  const type = (getRequestHeader(event, 'content-type') ?? '').toLowerCase()
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  const multipart = type.startsWith('multipart/form-data')
  const limit = multipart ? UPLOAD_LIMIT_BYTES : JSON_LIMIT_BYTES
  if (length > limit) {
    throw createError({ statusCode: 413, message: `body: larger than ${Math.round(limit / 1048576)} MB`, data: { fields: { body: 'too large' } } })
  }
  if (multipart) {
    if (!UPLOAD_ROUTES.test(event.path)) throw createError({ statusCode: 415, message: 'body: send JSON (application/json), not multipart/form-data', data: { fields: { body: 'wrong content type' } } })
    return
  }
  if (type && !type.startsWith('application/json') && !type.startsWith('text/plain')) {
    throw createError({ statusCode: 415, message: `body: send JSON (application/json), not ${type.split(';')[0]}`, data: { fields: { body: 'wrong content type' } } })
  }
  const raw = await readRawBody(event, 'utf8')
  if (raw === undefined || raw.trim() === '') return
  if (raw.length > JSON_LIMIT_BYTES) throw createError({ statusCode: 413, message: 'body: larger than 1 MB', data: { fields: { body: 'too large' } } })
  try {
    JSON.parse(raw)
  }
  catch {
    throw createError({ statusCode: 400, message: 'body: is not valid JSON', data: { fields: { body: 'not valid JSON' } } })
  }
})
