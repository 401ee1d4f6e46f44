import pg from 'pg'

// Talks to the built server that `npm test` starts; never mocks it.
export const baseUrl = process.env.TEST_BASE_URL ?? 'http://127.0.0.1:3100'
export const DEMO_PASSWORD = 'tautline-demo'

export interface Reply<T = any> { status: number, body: T, headers: Headers }

export class ApiClient {
  constructor(public cookie: string | null = null, public base = baseUrl) {}

  async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Reply<T>> {
    const init: RequestInit = { method, headers: { accept: 'application/json', ...headers }, redirect: 'manual' }
    if (this.cookie) (init.headers as Record<string, string>).cookie = this.cookie
    if (body instanceof FormData) init.body = body
    else if (typeof body === 'string') { init.body = body; (init.headers as Record<string, string>)['content-type'] ??= 'application/json' }
    else if (body !== undefined) { init.body = JSON.stringify(body); (init.headers as Record<string, string>)['content-type'] = 'application/json' }
    const res = await fetch(this.base + path, init)
    const setCookie = res.headers.getSetCookie().find(c => c.startsWith('nuxt-session='))
    if (setCookie) this.cookie = setCookie.split(';')[0]!
    const text = await res.text()
    let parsed: unknown = text
    try { parsed = text ? JSON.parse(text) : null }
    catch { /* not JSON */ }
    return { status: res.status, body: parsed as T, headers: res.headers }
  }

  get<T = any>(path: string) { return this.request<T>('GET', path) }
  post<T = any>(path: string, body?: unknown) { return this.request<T>('POST', path, body ?? {}) }
  patch<T = any>(path: string, body?: unknown) { return this.request<T>('PATCH', path, body ?? {}) }
}

export async function signIn(email: string, password = DEMO_PASSWORD, base = baseUrl): Promise<ApiClient> {
  const client = new ApiClient(null, base)
  const r = await client.post('/api/auth/login', { email, password })
  if (r.status !== 200) throw new Error(`sign-in as ${email} failed: ${r.status} ${JSON.stringify(r.body)}`)
  return client
}

export const accounts = {
  admin: 'admin@demo.tautline.test',
  officer: 'officer@demo.tautline.test',
  installer: 'installer@demo.tautline.test',
  manager: 'manager@demo.tautline.test',
  manager2: 'manager2@demo.tautline.test',
  otherAdmin: 'admin@other.tautline.test',
} as const

/** A direct connection for fixtures and for checking what the server wrote. */
export async function database() {
  const client = new pg.Client({ connectionString: process.env.DATABASE_URL })
  await client.connect()
  return client
}

export async function idOf(db: pg.Client, sql: string, params: unknown[] = []): Promise<number> {
  const r = await db.query(sql, params)
  if (!r.rows[0]) throw new Error(`fixture not found: ${sql} ${params.join(',')}`)
  return Number(Object.values(r.rows[0])[0])
}

/** The ids the demo seed (and the second, unrelated workspace) give, looked up by ref. */
export async function fixtureIds(db: pg.Client) {
  const site = (ref: string) => idOf(db, 'SELECT id FROM sites WHERE ref = $1', [ref])
  const covering = (ref: string) => idOf(db, 'SELECT id FROM coverings WHERE ref = $1', [ref])
  const unitOf = (siteRef: string) => idOf(db, 'SELECT u.id FROM units u JOIN sites s ON s.id = u.site_id WHERE s.ref = $1 ORDER BY u.id LIMIT 1', [siteRef])
  const openingOf = (siteRef: string) => idOf(db, 'SELECT o.id FROM openings o JOIN sites s ON s.id = o.site_id WHERE s.ref = $1 ORDER BY o.id LIMIT 1', [siteRef])
  const clientOf = (siteRef: string) => idOf(db, 'SELECT client_id FROM sites WHERE ref = $1', [siteRef])
  const user = (email: string) => idOf(db, 'SELECT id FROM users WHERE email = $1', [email])
  return {
    // client one (manager@) owns WAT; client two (manager2@) owns SPR; GRY is another workspace.
    own: { site: await site('WAT'), unit: await unitOf('WAT'), opening: await openingOf('WAT'), covering: await covering('WAT-1-01'), client: await clientOf('WAT'), user: await user(accounts.installer) },
    clientTwo: { site: await site('SPR'), unit: await unitOf('SPR'), opening: await openingOf('SPR'), covering: await covering('SPR-1-01'), client: await clientOf('SPR') },
    other: { site: await site('GRY'), unit: await unitOf('GRY'), opening: await openingOf('GRY'), covering: await covering('GRY-1-01'), client: await clientOf('GRY'), user: await user(accounts.otherAdmin) },
  }
}
