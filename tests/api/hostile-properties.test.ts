import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import fc from 'fast-check'
import type pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ApiClient } from '../support/api'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import { routeFiles } from '../support/routes'
import * as access from '../../shared/access'

// A property-based campaign over every route under server/api: fast-check generates malformed requests from each
// route's own schema (a field it reads given a value no schema may take, other fields given random JSON, ids that
// are not ids, bodies that are not JSON) and every answer must be a 4xx (a 400 naming the field), never a 5xx,
// within 2 s, and no row may be written anywhere. Sessions are signed in once, so no sign-in limit is touched.

/** Malformed requests in all (HOSTILE_REQUESTS to send more); each route with something to attack gets an equal share. */
const TOTAL_REQUESTS = Math.max(10_000, Number(process.env.HOSTILE_REQUESTS) || 0)
const HANG_MS = 2_000
// A new seed each run, so the campaign keeps covering new ground; a failure prints its seed, and HOSTILE_SEED replays it.
const SEED = Number(process.env.HOSTILE_SEED) || Math.floor(Math.random() * 2 ** 31)

const schemaModules = ['audit', 'auth', 'common', 'imports', 'inspection', 'jobs', 'mail', 'portfolio', 'register', 'removal'].map(m => `../../shared/schemas/${m}.ts`)
const otherModules = ['../../rules/index.ts', '../../server/services/labels.ts', '../../server/services/report-dispatch.ts']
// Schemas written inside a route file, which cannot be imported: their fields, by route.
const inlineSchemaFields: Record<string, string[]> = {
  'GET /api/activity': ['page', 'pageSize', 'sort', 'q', 'entity', 'entityId'],
  'GET /api/sites/:id/reports': ['page', 'pageSize'],
}
// Routes whose body is ignored: only their address is attacked. Signing out would end the campaign's session.
const bodyIgnored = new Set(['POST /api/sites/:id/audits', 'POST /api/jobs/:id/cancel'])
const skipped = new Set(['POST /api/auth/logout'])
// Files only, as multipart/form-data: a JSON body is the wrong kind and must be refused naming `body`.
const multipartOnly = new Set(['POST /api/imports', 'POST /api/coverings/:id/photos'])

const tables = ['workspaces', 'clients', 'users', 'sites', 'units', 'openings', 'coverings', 'inspections', 'findings', 'photos', 'inspection_photos',
  'audits', 'audit_items', 'fixes', 'report_dispatches', 'jobs', 'imports', 'activity_log', 'user_tokens']

interface Route { key: string, method: string, template: string, body: string[], query: string[], ids: string[], roles: string[] | null }
interface Outcome { route: string, kind: string, status: number, ms: number, message: unknown, fields: unknown, request: string }

let db: pg.Client
let sessions: Record<'admin' | 'manager', ApiClient>
let ownIds: Record<string, number>
const outcomes: Outcome[] = []

/** Every exported zod object schema by name, from shared/schemas, the rulebook and the services routes import from. */
async function schemaIndex() {
  const index = new Map<string, string[]>()
  for (const path of [...schemaModules, ...otherModules]) {
    const mod = await import(/* @vite-ignore */ path) as Record<string, unknown>
    for (const [name, value] of Object.entries(mod)) {
      const shape = (value as { shape?: Record<string, unknown> } | null)?.shape
      if (shape && typeof shape === 'object') index.set(name, Object.keys(shape))
    }
  }
  return index
}

/** Each route with the fields its body and query schemas read, found from the validateWith(...) calls in its file. */
async function routesWithSchemas(): Promise<{ routes: Route[], unknown: string[] }> {
  const index = await schemaIndex()
  const unknown: string[] = []
  const routes = routeFiles().filter(r => !r.key.startsWith('NO-METHOD') && !skipped.has(r.key)).map(({ file, key }) => {
    const source = readFileSync(join(process.cwd(), 'server/api', file), 'utf8')
    const [method, template] = key.split(' ') as [string, string]
    const fieldsOf = (reader: string) => [...source.matchAll(new RegExp(`${reader}\\(event, validateWith\\((\\w+)\\)\\)`, 'g'))].flatMap((m) => {
      const found = index.get(m[1]!) ?? inlineSchemaFields[key]
      if (!found) unknown.push(`${key}: ${m[1]}`)
      return found ?? []
    })
    // The roles the route lets in, read from its guard rather than probed (a probe could change something).
    const guard = /requireRole\(event, (\w+)\)/.exec(source)?.[1]
    const roles = guard && guard in access ? [...access[guard as keyof typeof access] as readonly string[]] : null
    return { key, method, template, body: fieldsOf('readValidatedBody'), query: fieldsOf('getValidatedQuery'), ids: [...template.matchAll(/:(\w+)/g)].map(m => m[1]!), roles }
  })
  return { routes, unknown }
}

// ----- what is generated -----

// Tab, line feed and carriage return are allowed in multi-line text (notes), so they are not among them.
const controlCharacter = fc.constantFrom(...[...Array.from({ length: 32 }, (_, i) => i).filter(c => ![9, 10, 13].includes(c)), 0x7F].map(c => String.fromCharCode(c)))
/** Text with a control character inside it (where trimming cannot reach): no field of any schema may take it. */
const hostileText = fc.tuple(fc.string({ maxLength: 24, unit: 'grapheme' }), controlCharacter, fc.string({ maxLength: 24, unit: 'grapheme' })).map(([a, c, b]) => `${a}${c}${b}`)
/** Longer than any text field allows (the longest, notes, takes 2,000 characters). */
const oversized = fc.tuple(fc.constantFrom('x', 'é', '1', ' a'), fc.integer({ min: 2_001, max: 20_000 })).map(([s, n]) => s.repeat(Math.ceil(n / s.length)))
const neverValid = fc.oneof(hostileText, oversized)
/** Anything at all for the other fields: strings, numbers, booleans, null, arrays and objects. */
const anyJson = fc.jsonValue({ maxDepth: 2 })
/** Not an id: anything but 1 to 10 plain digits, and never a path of dots (which the URL would resolve away). */
const notAnId = fc.oneof(
  fc.string({ minLength: 1, maxLength: 14, unit: 'binary' }),
  fc.integer({ max: 0 }).map(String),
  fc.double({ noNaN: false }).map(String),
  fc.bigInt({ min: 10_000_000_000n, max: 10n ** 30n }).map(String),
  fc.constantFrom('true', 'false', 'null', '1e3', '0x10', '-1', '1.0', ' 1', '1 ', '+1', '١٢', '%00', '\u0000', '1;DROP TABLE sites'),
).filter(s => !/^\d{1,10}$/.test(s) && !/^\.+$/.test(s.trim()) && s.trim() !== '')
/** JSON, but not an object: null, a list, text, a number or a boolean. */
const notAnObject = fc.oneof(fc.constant(null), fc.array(anyJson, { maxLength: 4 }), fc.string({ maxLength: 40 }), fc.double(), fc.boolean())
/** A body that is not JSON at all (nor empty, which reads as no body). */
const notJson = fc.string({ minLength: 1, maxLength: 200, unit: 'binary' }).filter((s) => {
  if (s.trim() === '') return false
  try { JSON.parse(s); return false }
  catch { return true }
})

interface Generated { kind: string, method: string, path: string, body?: string, headers: Record<string, string> }

function generatorFor(route: Route): fc.Arbitrary<Generated> {
  const { method, template } = route
  const pathWith = (bad?: { name: string, value: string }) => template.replace(/:(\w+)/g, (_, name: string) =>
    encodeURIComponent(bad?.name === name ? bad.value : name === 'name' ? 'no-such.eml' : resourceId(template)))
  const json = { 'content-type': 'application/json' }
  const options: Array<fc.Arbitrary<Generated>> = []
  if (route.ids.length) {
    options.push(fc.tuple(fc.constantFrom(...route.ids), notAnId).map(([name, value]) => ({ kind: `bad ${name}`, method, path: pathWith({ name, value }),
      body: method === 'GET' ? undefined : '{}', headers: method === 'GET' ? {} : json })))
  }
  const readsBody = method !== 'GET' && !bodyIgnored.has(route.key)
  if (readsBody && multipartOnly.has(route.key)) {
    options.push(fc.dictionary(fc.string({ maxLength: 12 }), anyJson, { maxKeys: 4 }).map(body => ({ kind: 'JSON to a file route', method, path: pathWith(), body: JSON.stringify(body), headers: json })))
  }
  else if (readsBody && route.body.length) {
    const others = fc.dictionary(fc.constantFrom(...route.body), anyJson, { maxKeys: route.body.length })
    options.push(fc.tuple(fc.constantFrom(...route.body), neverValid, others).map(([field, value, rest]) => ({
      kind: `bad ${field}`, method, path: pathWith(), body: JSON.stringify({ ...rest, [field]: value }), headers: json })))
  }
  if (readsBody && !multipartOnly.has(route.key)) {
    // A key that would reach an object's prototype, written plainly or with \u escapes, among the route's fields.
    const others = fc.dictionary(fc.constantFrom(...(route.body.length ? route.body : ['name'])), anyJson, { maxKeys: 3 })
    options.push(fc.tuple(fc.constantFrom('__proto__', 'constructor', '\\u005f_proto__', 'construct\\u006fr'), anyJson, others).map(([key, value, rest]) => ({
      kind: 'prototype key', method, path: pathWith(), body: `{${[...Object.entries(rest).map(([k, v]) => `${JSON.stringify(k)}:${JSON.stringify(v)}`), `"${key}":${JSON.stringify(value)}`].join(',')}}`, headers: json })))
  }
  if (readsBody) {
    options.push(notJson.map(raw => ({ kind: 'not JSON', method, path: pathWith(), body: raw, headers: json })))
    options.push(fc.tuple(notAnObject, fc.constantFrom('application/json', 'text/plain', 'application/json; charset=utf-8')).map(([body, type]) => ({
      kind: 'JSON but not an object', method, path: pathWith(), body: JSON.stringify(body), headers: { 'content-type': type } })))
  }
  if (route.query.length) {
    const others = fc.dictionary(fc.constantFrom(...route.query), fc.string({ maxLength: 20 }), { maxKeys: 3 })
    options.push(fc.tuple(fc.constantFrom(...route.query), neverValid, others).map(([field, value, rest]) => ({
      kind: `bad query ${field}`, method, path: `${pathWith()}?${new URLSearchParams({ ...rest, [field]: value.slice(0, 1_500) })}`, body: undefined, headers: {} })))
    // A parameter given twice arrives as a list, which no query field takes.
    options.push(fc.tuple(fc.constantFrom(...route.query), fc.string({ maxLength: 8 }), fc.string({ maxLength: 8 })).map(([field, a, b]) => {
      const params = new URLSearchParams([[field, a], [field, b]])
      return { kind: `repeated query ${field}`, method, path: `${pathWith()}?${params}`, body: undefined, headers: {} }
    }))
  }
  if (!options.length) {
    // Nothing to attack but the address: random query strings, which such a route must ignore without failing.
    options.push(fc.dictionary(fc.string({ minLength: 1, maxLength: 10 }), fc.string({ maxLength: 30 }), { maxKeys: 3 }).map(q => ({
      kind: 'stray query', method, path: `${pathWith()}?${new URLSearchParams(q)}`, body: method === 'GET' ? undefined : '{}', headers: method === 'GET' ? {} : json })))
  }
  return fc.oneof(...options)
}

function resourceId(template: string): string {
  const resource = template.split('/')[2]!
  const key = { sites: 'site', units: 'unit', openings: 'opening', coverings: 'covering', clients: 'client', users: 'user', photos: 'photo', audits: 'audit', fixes: 'fix', imports: 'import', jobs: 'job', rechecks: 'job', exports: 'job' }[resource]
  return String((key && ownIds[key]) ?? 1)
}

async function send(route: Route, client: ApiClient, g: Generated): Promise<Outcome> {
  const t0 = performance.now()
  let status = 0, message: unknown, fields: unknown
  try {
    const res = await fetch(baseUrl + g.path, { method: g.method, body: g.body, headers: { cookie: client.cookie ?? '', ...g.headers }, redirect: 'manual', signal: AbortSignal.timeout(10_000) })
    status = res.status
    const text = await res.text()
    try {
      const parsed = JSON.parse(text) as { message?: unknown, data?: { fields?: unknown } }
      message = parsed.message
      fields = parsed.data?.fields
    }
    catch { /* a file or a page */ }
  }
  catch (err) {
    status = 599
    message = `no answer: ${(err as Error).message}`
  }
  const outcome = { route: route.key, kind: g.kind, status, ms: performance.now() - t0, message, fields, request: `${g.method} ${g.path.slice(0, 160)} ${(g.body ?? '').slice(0, 160)}` }
  outcomes.push(outcome)
  return outcome
}

/** What is wrong with an answer to a malformed request, or null when it is as it must be. */
function problemWith(route: Route, o: Outcome): string | null {
  if (o.status >= 500) return `answered ${o.status}: ${String(o.message)}`
  if (o.ms > HANG_MS) return `took ${Math.round(o.ms)} ms`
  const malformed = o.kind !== 'stray query'
  if (malformed && o.status < 400) return `accepted (${o.status})`
  if ([400, 413, 415].includes(o.status)) {
    const keys = o.fields && typeof o.fields === 'object' ? Object.keys(o.fields) : []
    if (typeof o.message !== 'string' || !keys.some(k => (o.message as string).includes(k.split('.').pop()!))) return `${o.status} does not name the field: ${String(o.message)} ${JSON.stringify(o.fields)}`
  }
  return null
}

async function counts() {
  const out: Record<string, number> = {}
  for (const t of tables) {
    if ((await db.query('SELECT to_regclass($1) AS t', [t])).rows[0].t) out[t] = (await db.query(`SELECT count(*)::int AS n FROM ${t}`)).rows[0].n
  }
  return out
}

let routes: Route[] = []
let unknownSchemas: string[] = []
let before: Record<string, number>
const started = performance.now()

beforeAll(async () => {
  db = await database()
  const ids = await fixtureIds(db)
  const latest = async (table: string, where = '') => Number((await db.query(`SELECT id FROM ${table} ${where} ORDER BY id DESC LIMIT 1`)).rows[0]?.id ?? 1)
  ownIds = { ...ids.own, photo: await latest('photos'), audit: await latest('audits'), fix: await latest('fixes'), import: await latest('jobs', 'WHERE kind = \'import\''), job: await latest('jobs') }
  sessions = { admin: await signIn(accounts.admin), manager: await signIn(accounts.manager) }
  const found = await routesWithSchemas()
  routes = found.routes
  unknownSchemas = found.unknown
  before = await counts()
})
afterAll(async () => { await db.end() })

describe('generated hostile requests against every route', () => {
  it('knows the schema of every route, so a new route cannot slip past the campaign', () => {
    expect(unknownSchemas).toEqual([])
    expect(routes.length).toBeGreaterThan(50)
  })

  it(`answer ${TOTAL_REQUESTS.toLocaleString('en')} malformed requests with a 4xx naming the field, never a 5xx, each within ${HANG_MS} ms`, { timeout: 600_000 }, async () => {
    // Routes with nothing to attack but stray query strings get a token share; the rest share the malformed requests.
    const attackable = routes.filter(r => r.ids.length || r.query.length || (r.method !== 'GET' && !bodyIgnored.has(r.key)))
    const runs = Math.ceil(TOTAL_REQUESTS / attackable.length)
    const failures: string[] = []
    for (const route of routes) {
      // A role the route lets in, so the input checks are what answers.
      const client = route.roles && !route.roles.includes('admin') && route.roles.includes('manager') ? sessions.manager : sessions.admin
      let found = ''
      try {
        await fc.assert(fc.asyncProperty(generatorFor(route), async (g) => {
          const o = await send(route, client, g)
          const problem = problemWith(route, o)
          if (problem) {
            found = `${problem} for ${o.request}`
            throw new Error(problem)
          }
        }), { numRuns: attackable.includes(route) ? runs : 20, seed: SEED, endOnFailure: true })
      }
      catch (err) {
        failures.push(`${route.key} (seed ${SEED}, ${(err as Error).message.split('\n')[0]}): ${found}`)
      }
    }
    const seconds = (performance.now() - started) / 1000
    const malformed = outcomes.filter(o => o.kind !== 'stray query').length
    const slowest = outcomes.reduce((a, b) => (b.ms > a.ms ? b : a), outcomes[0]!)
    const serverErrors = outcomes.filter(o => o.status >= 500)
    const hangs = outcomes.filter(o => o.ms > HANG_MS)
    const byStatus = Object.entries(outcomes.reduce<Record<number, number>>((m, o) => ({ ...m, [o.status]: (m[o.status] ?? 0) + 1 }), {})).map(([s, n]) => `${s}: ${n}`).join(', ')
    console.log(`hostile campaign (seed ${SEED}): ${outcomes.length} requests (${malformed} malformed) over ${routes.length} routes in ${seconds.toFixed(1)} s; `
      + `5xx: ${serverErrors.length}; over ${HANG_MS} ms: ${hangs.length}; slowest ${Math.round(slowest.ms)} ms (${slowest.request.slice(0, 80)}); by status ${byStatus}`)
    expect(failures).toEqual([])
    expect(malformed).toBeGreaterThanOrEqual(TOTAL_REQUESTS)
  })

  it('wrote no row anywhere', async () => {
    expect(await counts()).toEqual(before)
  })
})
