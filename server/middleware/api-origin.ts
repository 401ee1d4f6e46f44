// A state-changing API request must come from this app's own pages (or from a client that sends no browser
// headers at all, such as a script). The session cookie is SameSite=Lax, which still goes along from another
// port or subdomain of the same site, so the Origin header is what tells such a page apart from ours.
const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
const SAME_ORIGIN_FETCH = new Set(['same-origin', 'none'])

/** This app's origin: APP_URL's scheme, host and port, or without it the address the request came to. */
function ownOrigin(event: Parameters<typeof getRequestURL>[0]) {
  const configured = process.env.APP_URL
  if (configured) {
    try { return new URL(configured).origin }
    catch { /* an unreadable APP_URL falls back to the request's own address */ }
  }
  return getRequestURL(event).origin
}

export default defineEventHandler((event) => {
  if (!STATE_CHANGING.has(event.method) || !event.path.startsWith('/api/')) return
  const origin = getRequestHeader(event, 'origin')
  const fetchSite = getRequestHeader(event, 'sec-fetch-site')
  const own = ownOrigin(event)
  let refused: string | null = null
  if (origin !== undefined) {
    if (origin !== own) refused = `came from ${origin.slice(0, 100)}`
  }
  else if (fetchSite !== undefined && !SAME_ORIGIN_FETCH.has(fetchSite.toLowerCase())) {
    refused = `came from a ${fetchSite.slice(0, 40)} page`
  }
  if (refused) {
    throw createError({
      statusCode: 403,
      message: `origin: this request ${refused}; changes are accepted only from Tautline's own pages at ${own}`,
      data: { fields: { origin: 'not this app\'s origin' } },
    })
  }
})
