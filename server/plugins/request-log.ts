import { randomUUID } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import type { WriteStream } from 'node:fs'

// One JSON line per request: an id, method, path (never the query string, which can carry tokens),
// status, duration and the user id. Never a body, a header, a password or a cookie.
export default defineNitroPlugin((nitro) => {
  let sink: WriteStream | NodeJS.WriteStream = process.stdout
  if (process.env.LOG_FILE) sink = createWriteStream(process.env.LOG_FILE, { flags: 'a' })
  const started = new WeakMap<object, number>()

  nitro.hooks.hook('request', (event) => {
    started.set(event, performance.now())
    const incoming = getRequestHeader(event, 'x-request-id')
    const id = incoming && /^[\w-]{8,64}$/.test(incoming) ? incoming : randomUUID()
    event.context.requestId = id
    setResponseHeader(event, 'X-Request-Id', id)
  })

  nitro.hooks.hook('afterResponse', (event) => {
    const t0 = started.get(event)
    const line = {
      t: new Date().toISOString(),
      level: 'info',
      id: event.context.requestId,
      method: event.method,
      path: event.path.split('?')[0],
      status: getResponseStatus(event),
      ms: t0 === undefined ? null : Math.round((performance.now() - t0) * 10) / 10,
      user: (event.context.tautlineUser as { id?: number } | undefined)?.id ?? null,
    }
    sink.write(`${JSON.stringify(line)}\n`)
  })

  nitro.hooks.hook('error', (error, { event }) => {
    const status = (error as { statusCode?: number }).statusCode ?? 500
    if (status < 500) return
    sink.write(`${JSON.stringify({ t: new Date().toISOString(), level: 'error', id: event?.context.requestId ?? null,
      path: event?.path.split('?')[0] ?? null, status, message: error.message })}\n`)
  })

  nitro.hooks.hook('close', () => {
    if (sink !== process.stdout) (sink as WriteStream).end()
  })
})
