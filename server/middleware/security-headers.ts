// Security headers on every response. Scripts and styles come only from this origin
// ('unsafe-inline' for the styles and the state script Nuxt inlines into the page).
export default defineEventHandler((event) => {
  setResponseHeaders(event, {
    'Content-Security-Policy': [
      `default-src 'self'`, `script-src 'self' 'unsafe-inline'`, `style-src 'self' 'unsafe-inline'`,
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
