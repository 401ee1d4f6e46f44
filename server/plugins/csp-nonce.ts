import { randomBytes } from 'node:crypto'

// Nuxt inlines a few script tags into every page (the import map naming the entry, the payload and the
// runtime config). Each page answer gets a fresh nonce on those tags and in its Content-Security-Policy,
// so no other inline script (an injected one included) can run. And no answer names the framework.
const SCRIPT_TAG = /<script\b/gi

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('render:html', (html, { event }) => {
    const nonce = randomBytes(18).toString('base64')
    const stamp = (chunks: string[]) => chunks.map(c => c.replace(SCRIPT_TAG, `<script nonce="${nonce}"`))
    html.head = stamp(html.head)
    html.bodyPrepend = stamp(html.bodyPrepend)
    html.bodyAppend = stamp(html.bodyAppend)
    const policy = String(getResponseHeader(event, 'content-security-policy') ?? '')
    if (policy) setResponseHeader(event, 'Content-Security-Policy', policy.replace(/script-src 'self'/, `script-src 'self' 'nonce-${nonce}'`))
  })

  nitroApp.hooks.hook('render:response', (response) => {
    if (response.headers) response.headers = Object.fromEntries(Object.entries(response.headers).filter(([name]) => name.toLowerCase() !== 'x-powered-by'))
  })

  // Anything else that sets the header (a static file, an error page) loses it before the answer is sent.
  nitroApp.hooks.hook('beforeResponse', (event) => {
    removeResponseHeader(event, 'x-powered-by')
  })
})
