// Security headers on every response. Scripts come only from this origin: no inline script runs unless it
// carries the per-response nonce that server/plugins/csp-nonce.ts gives the few tags Nuxt inlines into a page.
// Styles keep 'unsafe-inline': Vue writes style attributes (bound :style) that no nonce can cover.
export default defineEventHandler((event) => {
  setResponseHeaders(event, {
    'Content-Security-Policy': [
      `default-src 'self'`, `script-src 'self'`, `style-src 'self' 'unsafe-inline'`,
      `img-src 'self' data: blob:`, `font-src 'self'`, `connect-src 'self'`, `frame-ancestors 'none'`,
      `base-uri 'self'`, `form-action 'self'`, `object-src 'none'`,
    ].join('; '),
    'X-Frame-Options': 'DENY',
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'strict-origin-when-cross-origin',
    'Permissions-Policy': 'camera=(self), geolocation=(), microphone=()',
    'Cross-Origin-Opener-Policy': 'same-origin',
  })
  if (event.path.startsWith('/api/')) setResponseHeader(event, 'Cache-Control', 'no-store')
})
