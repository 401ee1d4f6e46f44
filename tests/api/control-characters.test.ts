import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { ApiClient, accounts, database, fixtureIds, signIn } from '../support/api'

// Free text never holds control characters: for every route that takes a text field, a NUL or a bell (U+0007)
// in it answers 400 naming the field, on create and on change, and nothing is written. Ids are whole numbers,
// never coerced from true or an empty string.

type Who = 'admin' | 'officer' | 'manager' | 'anon'
interface TextRoute { who: Who, method: 'POST' | 'PATCH', path: () => string, body: () => Record<string, unknown>, fields: string[] }

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let clients: Record<Exclude<Who, 'anon'>, ApiClient>
let auditId: number
const tables = ['clients', 'sites', 'units', 'openings', 'coverings', 'users', 'audit_items', 'audits', 'jobs', 'activity_log', 'report_dispatches', 'sign_in_attempts', 'user_tokens']

async function counts() {
  const out: Record<string, number> = {}
  for (const t of tables) {
    const exists = (await db.query('SELECT to_regclass($1) AS t', [t])).rows[0].t
    if (exists) out[t] = (await db.query(`SELECT count(*)::int AS n FROM ${t}`)).rows[0].n
  }
  return out
}

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  clients = { admin: await signIn(accounts.admin), officer: await signIn(accounts.officer), manager: await signIn(accounts.manager) }
  const audit = await clients.officer.post(`/api/sites/${ids.own.site}/audits`, {})
  expect([200, 201], JSON.stringify(audit.body)).toContain(audit.status)
  auditId = Number(audit.body.id)
})
afterAll(async () => { await db.end() })

const routes = (): TextRoute[] => [
  { who: 'officer', method: 'POST', path: () => '/api/clients', body: () => ({ name: 'Control Co', contactName: 'Ada', phone: '0400 000 000', reportEmail: 'ctrl@example.test' }), fields: ['name', 'contactName', 'phone', 'reportEmail'] },
  { who: 'officer', method: 'PATCH', path: () => `/api/clients/${ids.own.client}`, body: () => ({}), fields: ['name', 'contactName', 'phone', 'reportEmail'] },
  { who: 'officer', method: 'POST', path: () => '/api/sites', body: () => ({ clientId: ids.own.client, ref: 'CTRL-S', name: 'Control Court', address: '1 Plain St', jurisdiction: 'AU', premises: 'rental_home' }), fields: ['ref', 'name', 'address', 'notes'] },
  { who: 'officer', method: 'PATCH', path: () => `/api/sites/${ids.own.site}`, body: () => ({}), fields: ['ref', 'name', 'address', 'notes'] },
  { who: 'officer', method: 'POST', path: () => '/api/units', body: () => ({ siteId: ids.own.site, ref: 'CTRL-U' }), fields: ['ref', 'name', 'floor', 'notes'] },
  { who: 'officer', method: 'PATCH', path: () => `/api/units/${ids.own.unit}`, body: () => ({}), fields: ['ref', 'name', 'floor', 'notes'] },
  { who: 'officer', method: 'POST', path: () => '/api/openings', body: () => ({ unitId: ids.own.unit, ref: 'CTRL-O', room: 'Hall' }), fields: ['ref', 'room', 'notes'] },
  { who: 'officer', method: 'PATCH', path: () => `/api/openings/${ids.own.opening}`, body: () => ({}), fields: ['ref', 'room', 'notes'] },
  { who: 'officer', method: 'POST', path: () => '/api/coverings', body: () => ({ openingId: ids.own.opening, ref: 'CTRL-C', productType: 'roller', control: 'chain_loop' }), fields: ['ref', 'makerModel'] },
  { who: 'officer', method: 'PATCH', path: () => `/api/coverings/${ids.own.covering}`, body: () => ({}), fields: ['ref', 'makerModel'] },
  { who: 'admin', method: 'POST', path: () => '/api/users', body: () => ({ email: 'ctrl-invite@example.test', name: 'Invitee', role: 'installer' }), fields: ['email', 'name'] },
  { who: 'admin', method: 'PATCH', path: () => `/api/users/${ids.own.user}`, body: () => ({}), fields: ['name'] },
  { who: 'officer', method: 'POST', path: () => `/api/audits/${auditId}/items`, body: () => ({ coveringId: ids.own.covering, status: 'not_accessible', reason: 'locked' }), fields: ['reason'] },
  { who: 'officer', method: 'POST', path: () => `/api/audits/${auditId}/close`, body: () => ({}), fields: ['notes'] },
  { who: 'manager', method: 'POST', path: () => '/api/portfolio/audit-requests', body: () => ({ siteIds: [ids.own.site] }), fields: ['message'] },
  { who: 'officer', method: 'POST', path: () => '/api/rechecks', body: () => ({ scope: 'site', id: ids.own.site }), fields: ['ruleSetFixture'] },
  { who: 'officer', method: 'POST', path: () => `/api/sites/${ids.own.site}/report/email`, body: () => ({}), fields: ['to'] },
  { who: 'anon', method: 'POST', path: () => '/api/auth/login', body: () => ({ email: accounts.officer, password: 'not-the-password' }), fields: ['email', 'password'] },
  { who: 'anon', method: 'POST', path: () => '/api/auth/reset-request', body: () => ({ email: accounts.officer }), fields: ['email'] },
  { who: 'anon', method: 'POST', path: () => '/api/auth/reset', body: () => ({ token: 'x'.repeat(32), password: 'a-long-enough-password' }), fields: ['password', 'name'] },
  { who: 'anon', method: 'POST', path: () => '/api/auth/accept-invite', body: () => ({ token: 'x'.repeat(32), password: 'a-long-enough-password' }), fields: ['password', 'name'] },
]

// Each value has the control character inside it, where trimming cannot remove it.
const emails: Record<string, string> = { '\u0000': 'ctrl\u0000x@example.test', '\u0007': 'ctrl\u0007x@example.test' }
const valueWith = (field: string, c: string) => (['email', 'reportEmail', 'to'].includes(field) ? emails[c] : field === 'password' ? `secret${c}password` : `Plain${c}Text`)

describe('text with control characters', () => {
  it('is refused on every route that takes text, naming the field, and nothing is written', { timeout: 60_000 }, async () => {
    const before = await counts()
    const wrong: string[] = []
    let sent = 0
    for (const route of routes()) {
      for (const field of route.fields) {
        for (const c of ['\u0000', '\u0007']) {
          const client = route.who === 'anon' ? new ApiClient() : clients[route.who]
          const r = await client.request(route.method, route.path(), { ...route.body(), [field]: valueWith(field, c) })
          sent++
          const label = `${route.method} ${route.path()} ${field}=${JSON.stringify(valueWith(field, c))}`
          if (r.status !== 400) wrong.push(`${label} → ${r.status} ${JSON.stringify(r.body?.message)}`)
          else if (!String(r.body.message).startsWith(field) || !r.body.data?.fields?.[field]) wrong.push(`${label} → 400 not naming ${field}: ${r.body.message}`)
        }
      }
    }
    expect(wrong).toEqual([])
    expect(sent).toBeGreaterThanOrEqual(90)
    expect(await counts()).toEqual(before)
  })

  it('keeps line breaks and tabs in notes, but no other control character, and none in one-line text', async () => {
    const officer = clients.officer
    const withBreaks = await officer.patch(`/api/units/${ids.own.unit}`, { notes: 'Key with the caretaker.\nSide gate:\tcode 1234\r\nCall first.' })
    expect(withBreaks.status, JSON.stringify(withBreaks.body)).toBe(200)
    expect(withBreaks.body.notes).toBe('Key with the caretaker.\nSide gate:\tcode 1234\r\nCall first.')
    for (const c of ['\u0000', '\u0007', '\u001B', '\u007F', '\u000B']) {
      const r = await officer.patch(`/api/units/${ids.own.unit}`, { notes: `Key${c}here` })
      expect(r.status, JSON.stringify(c)).toBe(400)
      expect(r.body.message).toMatch(/^notes holds a control character \(U\+00[0-9A-F]{2}\)/)
    }
    for (const c of ['\n', '\t']) {
      const r = await officer.patch(`/api/units/${ids.own.unit}`, { name: `Flat${c}2` })
      expect(r.status, JSON.stringify(c)).toBe(400)
      expect(r.body.data.fields.name).toMatch(/control character/)
    }
  })
})

describe('ids', () => {
  it('are whole numbers, never coerced from true, an empty string or a numeric string with an exponent', async () => {
    const officer = clients.officer
    const before = await counts()
    const bodies: Array<[string, Record<string, unknown>, string]> = [
      ['/api/rechecks', { scope: 'site', id: true }, 'id'],
      ['/api/rechecks', { scope: 'client', id: '' }, 'id'],
      ['/api/rechecks', { scope: 'site', id: '1e3' }, 'id'],
      ['/api/exports', { scope: 'site', id: true }, 'id'],
      ['/api/exports', { scope: 'client', id: false }, 'id'],
      ['/api/units', { siteId: true, ref: 'CTRL-ID' }, 'siteId'],
      ['/api/users', { email: 'ctrl-id@example.test', name: 'Id', role: 'manager', clientId: true }, 'clientId'],
    ]
    for (const [path, body, field] of bodies) {
      const r = await (path === '/api/users' ? clients.admin : officer).post(path, body)
      expect(r.status, `${path} ${JSON.stringify(body)}: ${JSON.stringify(r.body)}`).toBe(400)
      expect(r.body.data.fields[field], `${path} ${JSON.stringify(body)}`).toBeTruthy()
    }
    const manager = clients.manager
    const portfolio = await manager.post('/api/portfolio/audit-requests', { siteIds: [true] })
    expect(portfolio.status).toBe(400)
    expect(portfolio.body.message).toMatch(/^siteIds/)
    for (const q of ['siteId=', 'siteId=true', 'page=', 'pageSize=true']) {
      const r = await manager.get(`/api/portfolio/units?${q}`)
      expect(r.status, q).toBe(400)
      expect(r.body.message, q).toMatch(new RegExp(`^${q.split('=')[0]}`))
    }
    const fixes = await officer.get('/api/fixes?priority=')
    expect(fixes.status).toBe(400)
    expect(fixes.body.message).toMatch(/^priority/)
    expect(await counts()).toEqual(before)
  })
})
