import { readdirSync } from 'node:fs'
import { join, relative } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, accounts, database, fixtureIds, idOf, signIn } from '../support/api'

// Headers on every kind of answer, and every page with an id in its address refusing another tenant's record.

// Pages carry the whole policy; an API error answer carries the server's stricter one (no script at all).
function expectSecurityHeaders(h: Headers, what: string) {
  const csp = h.get('content-security-policy') ?? ''
  const isPage = (h.get('content-type') ?? '').startsWith('text/html')
  const parts = isPage ? [`default-src 'self'`, `frame-ancestors 'none'`, `object-src 'none'`, `base-uri 'self'`, `form-action 'self'`] : [`frame-ancestors 'none'`]
  for (const part of parts) expect(csp, `${what}: content-security-policy has ${part}`).toContain(part)
  expect(csp, `${what}: scripts only from this origin`).toMatch(/(script|default)-src '(self|none)'/)
  expect(csp, `${what}: no script from elsewhere`).not.toMatch(/script-src[^;]*(https?:|\*)/)
  expect(h.get('x-frame-options'), what).toBe('DENY')
  // Pages send the origin only, never the path, to other sites; error answers send nothing at all.
  expect(['strict-origin-when-cross-origin', 'no-referrer'], `${what}: referrer-policy`).toContain(h.get('referrer-policy'))
  if (isPage) expect(h.get('referrer-policy'), what).toBe('strict-origin-when-cross-origin')
  expect(h.get('x-content-type-options'), what).toBe('nosniff')
}

describe('security headers', () => {
  it('are on pages, API answers, errors and files, signed in or not', async () => {
    const anon = new ApiClient()
    const officer = await signIn(accounts.officer)
    const db = await database()
    const ids = await fixtureIds(db)
    await db.end()
    const cases: Array<[ApiClient, string, number]> = [
      [anon, '/login', 200], [anon, '/', 302], [anon, '/api/health', 200], [anon, '/api/sites', 401], [anon, '/no-such-page', 302], [officer, '/no-such-page', 404],
      [anon, '/api/no-such-route', 404], [officer, '/api/sites/1/no-such-thing', 404], [anon, '/api/imports/template.csv', 401], [officer, '/', 200], [officer, `/sites/${ids.own.site}`, 200],
      [officer, '/api/sites', 200], [officer, `/api/sites/${ids.own.site}/audit.csv`, 200], [officer, `/api/coverings/${ids.own.covering}/label.pdf?paper=a4`, 200],
      [officer, `/api/sites/${ids.other.site}`, 404], [officer, '/rulebook', 200],
    ]
    for (const [client, path, status] of cases) {
      const r = await client.request('GET', path, undefined, { accept: path.startsWith('/api/') ? 'application/json' : 'text/html' })
      expect(r.status, path).toBe(status)
      expectSecurityHeaders(r.headers, path)
      // Answers with data are never stored by a cache; error answers at least revalidate.
      if (path.startsWith('/api/')) expect(status < 400 ? ['no-store'] : ['no-store', 'no-cache'], path).toContain(r.headers.get('cache-control'))
    }
  })
})

describe('the framework is never named', () => {
  it('no X-Powered-By on pages, API answers, errors, payloads or static files', async () => {
    const anon = new ApiClient()
    const officer = await signIn(accounts.officer)
    const login = await anon.request('GET', '/login', undefined, { accept: 'text/html' })
    const assets = [...String(login.body).matchAll(/(?:src|href)="(\/_nuxt\/[^"]+)"/g)].map(m => m[1]!).slice(0, 3)
    expect(assets.length).toBeGreaterThan(0)
    const cases: Array<[ApiClient, string, string]> = [
      [anon, '/login', 'text/html'], [officer, '/', 'text/html'], [officer, '/no-such-page', 'text/html'], [anon, '/no-such-page', 'text/html'],
      [anon, '/api/health', 'application/json'], [anon, '/api/sites', 'application/json'], [anon, '/api/no-such-route', 'application/json'],
      [officer, '/api/sites', 'application/json'], [officer, '/api/sites/abc', 'application/json'], [anon, '/favicon.svg', '*/*'],
      [anon, '/_payload.json', '*/*'], [anon, '/login/_payload.json', '*/*'], [anon, '/_nuxt/no-such-file.js', '*/*'],
      ...assets.map(a => [anon, a, '*/*'] as [ApiClient, string, string]),
    ]
    for (const [client, path, accept] of cases) {
      const r = await client.request('GET', path, undefined, { accept })
      expect(r.headers.get('x-powered-by'), `${path} (${r.status})`).toBeNull()
    }
    const post = await officer.request('POST', '/api/units', 'not json{')
    expect(post.status).toBe(400)
    expect(post.headers.get('x-powered-by')).toBeNull()
  })
})

describe('scripts on a page', () => {
  const inlineScripts = (html: string) => [...html.matchAll(/<script\b([^>]*)>/gi)].map(m => m[1]!).filter(attrs => !/\bsrc=/.test(attrs))

  it('run only with this answer\'s nonce: no \'unsafe-inline\' for scripts, and every inline script carries the nonce', async () => {
    const officer = await signIn(accounts.officer)
    const seen = new Set<string>()
    for (const [client, path] of [[new ApiClient(), '/login'], [officer, '/'], [officer, '/rulebook'], [officer, '/no-such-page'], [new ApiClient(), '/login']] as const) {
      const r = await client.request('GET', path, undefined, { accept: 'text/html' })
      expect([200, 404], path).toContain(r.status)
      const csp = r.headers.get('content-security-policy') ?? ''
      const scriptSrc = csp.split(';').map(p => p.trim()).find(p => p.startsWith('script-src')) ?? ''
      expect(scriptSrc, path).not.toContain('unsafe-inline')
      expect(scriptSrc, path).not.toContain('unsafe-eval')
      const nonce = /'nonce-([A-Za-z0-9+/=]{16,})'/.exec(scriptSrc)?.[1]
      expect(nonce, `${path}: ${scriptSrc}`).toBeTruthy()
      expect(seen.has(nonce!), `${path}: a nonce is never reused`).toBe(false)
      seen.add(nonce!)
      const inline = inlineScripts(String(r.body))
      expect(inline.length, path).toBeGreaterThan(0)
      for (const attrs of inline) expect(attrs, path).toContain(`nonce="${nonce}"`)
    }
  })

  it('API answers allow no inline script at all', async () => {
    const r = await new ApiClient().request('GET', '/api/health')
    const csp = r.headers.get('content-security-policy') ?? ''
    const scriptSrc = csp.split(';').map(p => p.trim()).find(p => p.startsWith('script-src')) ?? ''
    expect(scriptSrc).toMatch(/^script-src '(self|none)'$/)
  })
})

/** Every page file whose address carries an id, as `/sites/:id/reports`. */
function pagesWithIds(dir = join(process.cwd(), 'pages')): string[] {
  const out: string[] = []
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name)
      if (e.isDirectory()) walk(p)
      else if (e.name.endsWith('.vue')) {
        const path = `/${relative(dir, p).replace(/\\/g, '/').replace(/\.vue$/, '')}`.replace(/\/index$/, '').replace(/\[(\w+)\]/g, ':$1')
        if (path.includes(':')) out.push(path)
      }
    }
  }
  walk(dir)
  // pages/sites/[id].vue and pages/sites/[id]/index.vue are the same address.
  return [...new Set(out)].sort()
}

describe('every page with an id in its address', () => {
  interface Target { site: number, covering: number, audit: number, secrets: string[] }
  let demo: Target
  let clientTwo: Target
  const kindOf: Record<string, keyof Omit<Target, 'secrets'>> = {
    '/audits/:id': 'audit', '/coverings/:id': 'covering', '/coverings/:id/fitting': 'covering', '/fit/:siteId': 'site',
    '/sites/:id': 'site', '/sites/:id/overview': 'site', '/sites/:id/reports': 'site',
  }

  beforeAll(async () => {
    const db = await database()
    const ids = await fixtureIds(db)
    const officer = await signIn(accounts.officer)
    const auditOf = async (site: number) => {
      const found = await db.query('SELECT id FROM audits WHERE site_id = $1 LIMIT 1', [site])
      if (found.rows[0]) return Number(found.rows[0].id)
      const r = await officer.post(`/api/sites/${site}/audits`, {})
      expect(r.status, JSON.stringify(r.body)).toBe(201)
      return Number(r.body.id)
    }
    const secrets = async (site: number, covering: number) => [
      await db.query('SELECT name FROM sites WHERE id = $1', [site]).then(r => r.rows[0].name as string),
      await db.query('SELECT ref FROM coverings WHERE id = $1', [covering]).then(r => r.rows[0].ref as string),
    ]
    demo = { site: ids.own.site, covering: ids.own.covering, audit: await auditOf(ids.own.site), secrets: await secrets(ids.own.site, ids.own.covering) }
    clientTwo = { site: ids.clientTwo.site, covering: ids.clientTwo.covering, audit: await auditOf(ids.clientTwo.site), secrets: await secrets(ids.clientTwo.site, ids.clientTwo.covering) }
    expect(await idOf(db, 'SELECT count(*) FROM sites WHERE id = $1', [demo.site])).toBe(1)
    await db.end()
  })

  it('is known to this test, so a new page cannot skip the check', () => {
    expect(pagesWithIds()).toEqual(Object.keys(kindOf).sort())
  })

  it('shows another workspace\'s record to no one, and another client\'s record to no manager', async () => {
    const viewers: Array<[string, ApiClient, Target]> = [
      ['the other workspace\'s admin', await signIn(accounts.otherAdmin), demo],
      ['client one\'s manager', await signIn(accounts.manager), clientTwo],
    ]
    for (const [who, viewer, target] of viewers) {
      for (const page of pagesWithIds()) {
        const path = page.replace(/:\w+/, String(target[kindOf[page]!]))
        const r = await viewer.request('GET', path, undefined, { accept: 'text/html' })
        // A page the role may not open answers 403 whoever's record it is; any other answers "not found".
        expect([403, 404], `${who} opening ${path} got ${r.status}`).toContain(r.status)
        const html = String(r.body)
        for (const secret of target.secrets) expect(html, `${who} opening ${path}`).not.toContain(secret)
      }
    }
  })
})
