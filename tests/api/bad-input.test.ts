import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import type { ApiClient } from '../support/api'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import { routeFiles } from '../support/routes'

// A generated campaign of malformed requests against every route under server/api. Every answer must
// be a 4xx whose message names the field (or `body`, `id`), never a 5xx, and nothing may be written.

const badIds = ['abc', '-1', '0', '1.5', '99999999999999', '1e3', `1'OR'1'='1`, '%00', 'null', '0x10', '..%2F..%2Fetc%2Fpasswd']
const fields = ['name', 'ref', 'email', 'password', 'siteId', 'unitId', 'openingId', 'clientId', 'coveringId', 'widthMm', 'measurements',
  'kind', 'status', 'reason', 'dueOn', 'assigneeId', 'to', 'scope', 'id', 'role', 'productType', 'control', 'jurisdiction', 'token']
// Wrong types, absurd sizes and lengths; an unknown choice only where the field is a choice.
const badValues: unknown[] = [{ nested: { deeper: true } }, 'x'.repeat(100_000), -1, 1e15, [], true]
const choiceFields = new Set(['kind', 'status', 'scope', 'role', 'productType', 'control', 'jurisdiction'])
const rawBodies = ['not json{', '{"a":', '[]', 'null', '"text"', '12', 'true', '{"name": "\u0000"', '-0.00004646480726427454', '584665965305162760000',
  '{"__proto__": {"admin": true}}', '{"name": "x", "constructor": {"prototype": {}}}', '{"ref": "A", "\\u005f_proto__": 1}']
const badQueries = ['page=-1', 'pageSize=abc', 'pageSize=100000', 'sort=password', `q=${'x'.repeat(5000)}`, 'page=1e99', 'siteId=abc', 'status=zzz']
// Routes whose body is ignored or that end the caller's session; their body variants prove nothing.
const bodiless = new Set(['POST /api/auth/logout', 'POST /api/sites/:id/audits'])
const evidenceAndRegister = ['workspaces', 'clients', 'users', 'sites', 'units', 'openings', 'coverings', 'inspections', 'findings', 'photos', 'inspection_photos', 'audits', 'audit_items', 'fixes', 'report_dispatches']

let db: pg.Client
let admin: ApiClient
let manager: ApiClient
let ownIds: Record<string, number>
const outcomes: Array<{ route: string, variant: string, status: number, message: unknown, fields: unknown }> = []

async function counts() {
  const out: Record<string, number> = {}
  for (const t of evidenceAndRegister) out[t] = (await db.query(`SELECT count(*)::int AS n FROM ${t}`)).rows[0].n
  return out
}

function resourceId(path: string): string {
  const resource = path.split('/')[2]!
  const key = { sites: 'site', units: 'unit', openings: 'opening', coverings: 'covering', clients: 'client', users: 'user', photos: 'photo', audits: 'audit', fixes: 'fix' }[resource]
  return String((key && ownIds[key]) ?? 1)
}

async function send(client: ApiClient, route: string, variant: string, method: string, path: string, body?: BodyInit, headers: Record<string, string> = {}) {
  const res = await fetch(baseUrl + path, { method, body, headers: { cookie: client.cookie ?? '', ...headers } })
  const text = await res.text()
  let parsed: { message?: unknown, data?: { fields?: unknown } } = {}
  try { parsed = JSON.parse(text) }
  catch { /* non-JSON (PDF, CSV, image) */ }
  outcomes.push({ route, variant, status: res.status, message: parsed.message, fields: parsed.data?.fields })
}

beforeAll(async () => {
  db = await database()
  const ids = await fixtureIds(db)
  const latest = async (table: string) => Number((await db.query(`SELECT id FROM ${table} ORDER BY id DESC LIMIT 1`)).rows[0]?.id ?? 1)
  ownIds = { ...ids.own, photo: await latest('photos'), audit: await latest('audits'), fix: await latest('fixes') }
  admin = await signIn(accounts.admin)
  manager = await signIn(accounts.manager)
})
afterAll(async () => { await db.end() })

const routes = routeFiles().filter(r => !r.key.startsWith('NO-METHOD'))
let before: Record<string, number>

describe('malformed requests across every route', () => {
  beforeAll(async () => { before = await counts() })

  for (const { key } of routes) {
    it(`${key}: answers each malformed request with a 4xx naming the field, never a 5xx`, { timeout: 120_000 }, async () => {
      const mark = outcomes.length
      await campaign(key)
      const mine = outcomes.slice(mark)
      const serverErrors = mine.filter(o => o.status >= 500)
      expect(serverErrors.map(o => `[${o.variant}] → ${o.status} ${String(o.message)}`)).toEqual([])
      const accepted = mine.filter(o => o.status < 400 && !o.route.startsWith('GET'))
      expect(accepted.map(o => `[${o.variant}] → ${o.status}`), 'a malformed write was accepted').toEqual([])
      const unnamed = mine.filter((o) => {
        if (o.status !== 400) return false
        const keys = o.fields && typeof o.fields === 'object' ? Object.keys(o.fields) : []
        return typeof o.message !== 'string' || !keys.some(k => (o.message as string).includes(k.split('.').pop()!))
      })
      expect(unnamed.map(o => `[${o.variant}] → ${String(o.message)} ${JSON.stringify(o.fields)}`), '400s must name the field').toEqual([])
    })
  }

  it('sent at least 1,000 malformed requests and wrote no row anywhere', async () => {
    expect(outcomes.length).toBeGreaterThanOrEqual(1000)
    expect(await counts()).toEqual(before)
  })
})

async function campaign(key: string) {
  const [method, template] = key.split(' ') as [string, string]
  const path = template.replace(/:(\w+)/, (_, p: string) => (p === 'name' ? 'no-such.eml' : resourceId(template)))
  // Use a role the route lets in, so the input checks are what answers.
  const probe = await admin.request(method, path, method === 'GET' ? undefined : {})
  const client = probe.status === 403 ? manager : admin
  if (template.includes(':')) {
    for (const id of badIds) await send(client, key, `id=${id}`, method, template.replace(/:\w+/, id), method === 'GET' ? undefined : '{}', { 'content-type': 'application/json' })
  }
  if (method === 'GET') {
    for (const q of badQueries) await send(client, key, `query ${q.slice(0, 20)}`, method, `${path}?${q}`)
    return
  }
  if (bodiless.has(key)) return
  for (const raw of rawBodies) await send(client, key, `raw ${raw}`, method, path, raw, { 'content-type': 'application/json' })
  for (const field of fields) {
    for (const value of choiceFields.has(field) ? [...badValues, 'zzz-not-a-choice'] : badValues) await send(client, key, `${field}=${JSON.stringify(value).slice(0, 20)}`, method, path, JSON.stringify({ [field]: value }), { 'content-type': 'application/json' })
  }
  await send(client, key, 'oversized', method, path, JSON.stringify({ name: 'x'.repeat(2 * 1024 * 1024) }), { 'content-type': 'application/json' })
  await send(client, key, 'wrong encoding', method, path, new Uint8Array([0x7B, 0xFF, 0xFE, 0x22, 0xC3, 0x28, 0x7D]), { 'content-type': 'application/json' })
  await send(client, key, 'xml', method, path, '<site><name>x</name></site>', { 'content-type': 'application/xml' })
  await send(client, key, 'broken multipart', method, path, '--xyz\r\nContent-Disposition: form-data; name="file"\r\n\r\nnot closed', { 'content-type': 'multipart/form-data; boundary=xyz' })
}

describe('a body of JSON null', () => {
  // null is a body, and not an object: it must not read as "no body", which would let a route whose fields are
  // all optional (closing an audit, e-mailing a report) act on it.
  it('is refused naming body, and nothing is sent or written', async () => {
    const db2 = await database()
    const ids = await fixtureIds(db2)
    const officer = await signIn(accounts.officer)
    const opened = await officer.post(`/api/sites/${ids.own.site}/audits`, {})
    expect([200, 201]).toContain(opened.status)
    const tally = async () => (await db2.query(`SELECT (SELECT count(*) FROM report_dispatches)::int AS sent, (SELECT count(*) FROM activity_log)::int AS log,
      (SELECT status FROM audits WHERE id = $1) AS audit`, [opened.body.id])).rows[0]
    const before = await tally()
    for (const path of [`/api/audits/${opened.body.id}/close`, `/api/sites/${ids.own.site}/report/email`]) {
      for (const type of ['application/json', 'application/json; charset=utf-8']) {
        const r = await officer.request('POST', path, 'null', { 'content-type': type })
        expect(r.status, `${path} ${type}: ${JSON.stringify(r.body)}`).toBe(400)
        expect(r.body.data?.fields?.body, `${path} ${type}: ${JSON.stringify(r.body)}`).toBe('must be a JSON object')
      }
    }
    expect(await tally()).toEqual(before)
    await db2.end()
  })
})

describe('malformed CSV files', () => {
  // A file in another encoding, binary data or broken quoting is refused when it is sent, naming `file` and the
  // line, before any job or import row exists; nothing half-read reaches the register.
  const header = 'site_ref,site_name,address,jurisdiction,premises,unit_ref,room,opening_ref,covering_ref,control,head_height_mm'
  const row = 'WAT,Wattle Court,1 Example Way,AU,rental_home,U-9,Bedroom,W1,C-9,chain_loop,2100mm'
  const utf16 = Buffer.concat([Buffer.from([0xFF, 0xFE]), Buffer.from(`${header}\n${row}\n`, 'utf16le')])
  const latin1 = Buffer.concat([Buffer.from(`${header}\n`), Buffer.from(`${row.replace('Bedroom', 'Chambre d')}`), Buffer.from([0xE9]), Buffer.from('\n')])
  const files: Array<[string, Uint8Array, RegExp, number?]> = [
    ['UTF-16', utf16, /^file: it is saved as UTF-16 text/],
    ['Latin-1', latin1, /^file: line 2 is not UTF-8 text/],
    ['binary', Buffer.from([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 0x0D]), /^file: it holds binary data \(a NUL byte on line 3\)/],
    ['NUL in a row', Buffer.from(`${header}\n${row}\nWAT,\u0000\n`), /^file: it holds binary data \(a NUL byte on line 3\)/],
    ['unclosed quote', Buffer.from(`${header}\n${row}\nWAT,"Wattle Court,1 Example Way\nWAT,x\n`), /^file: a quoted cell opened on line 3 is never closed/],
    ['empty', Buffer.from(''), /^file: no file was attached/],
    ['blank lines only', Buffer.from('\n\n\r\n'), /^file: it is empty/],
    ['header only', Buffer.from(`${header}\n`), /^file: there are no rows below the header/],
    ['unknown column', Buffer.from(`${header},shoe_size\n${row},42\n`), /^file: .*shoe_size/],
    ['too many rows', Buffer.from(`${header}\n${`${row}\n`.repeat(50_001)}`), /^file: it has 50,001 rows; import at most/, 413],
  ]

  it('are refused on arrival, naming the file and the line, and start no import', async () => {
    const db = await database()
    const count = async () => (await db.query(`SELECT (SELECT count(*) FROM jobs)::int AS jobs, (SELECT count(*) FROM imports)::int AS imports`)).rows[0]
    const before = await count()
    const manager = await signIn(accounts.manager)
    for (const [what, data, message, status] of files) {
      const form = new FormData()
      form.append('mode', 'dry-run')
      form.append('file', new Blob([new Uint8Array(data)]), `${what}.csv`)
      const r = await manager.request('POST', '/api/imports', form)
      expect(r.status, `${what}: ${JSON.stringify(r.body)}`).toBe(status ?? 400)
      expect(r.body.message, what).toMatch(message)
      expect(r.body.data?.fields?.file, what).toBeTruthy()
    }
    expect(await count()).toEqual(before)
    await db.end()
  })
})
