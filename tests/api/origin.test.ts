import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'

// A page elsewhere, even on another port of the same host (the same site, so the SameSite=Lax session cookie
// goes along), cannot change anything: state-changing API requests must come from this app's own origin.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let officer: ApiClient
const own = new URL(process.env.APP_URL ?? baseUrl).origin
const unitCount = async () => Number((await db.query('SELECT count(*) AS n FROM units WHERE site_id = $1', [ids.own.site])).rows[0].n)

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  officer = await signIn(accounts.officer)
})
afterAll(async () => { await db.end() })

describe('a state-changing request from another origin', () => {
  const otherPort = `${new URL(own).protocol}//${new URL(own).hostname}:${Number(new URL(own).port || 80) + 1}`
  const refused: Array<[string, Record<string, string>]> = [
    ['another site', { 'origin': 'http://evil.test', 'sec-fetch-site': 'cross-site' }],
    ['another port of this host', { 'origin': otherPort, 'sec-fetch-site': 'same-site' }],
    ['another scheme', { origin: own.replace(/^http:/, 'https:') }],
    ['an opaque origin', { origin: 'null' }],
    ['a cross-site page that sent no Origin', { 'sec-fetch-site': 'cross-site' }],
    ['a same-site page that sent no Origin', { 'sec-fetch-site': 'same-site' }],
  ]

  for (const [what, headers] of refused) {
    it(`is refused with 403 naming origin: ${what}`, async () => {
      const before = await unitCount()
      for (const [method, path, body] of [['POST', '/api/units', { siteId: ids.own.site, ref: `ORIGIN-${what.length}` }], ['PATCH', `/api/units/${ids.own.unit}`, { name: 'Taken over' }]] as const) {
        const r = await officer.request(method, path, body, headers)
        expect(r.status, `${method} ${path}`).toBe(403)
        expect(r.body.message).toMatch(/^origin: /)
        expect(r.body.data.fields.origin).toBeTruthy()
      }
      expect(await unitCount()).toBe(before)
    })
  }

  it('cannot sign in, sign out or commit an import either', async () => {
    const evil = { origin: 'http://evil.test' }
    expect((await officer.request('POST', '/api/auth/login', { email: accounts.officer, password: 'x' }, evil)).status).toBe(403)
    expect((await officer.request('POST', '/api/auth/logout', {}, evil)).status).toBe(403)
    expect((await officer.request('POST', '/api/imports/1/commit', {}, evil)).status).toBe(403)
    // The session is still there: the refused sign-out changed nothing.
    expect((await officer.get('/api/me')).status).toBe(200)
  })
})

describe('requests this app accepts', () => {
  it('from its own pages (Origin or Sec-Fetch-Site same-origin) and from clients that send neither header', async () => {
    const before = await unitCount()
    const cases: Array<Record<string, string>> = [{ 'origin': own, 'sec-fetch-site': 'same-origin' }, { 'sec-fetch-site': 'same-origin' }, { 'sec-fetch-site': 'none' }, {}]
    for (const [i, headers] of cases.entries()) {
      const r = await officer.request('POST', '/api/units', { siteId: ids.own.site, ref: `ORIGIN-OK-${i}` }, headers)
      expect(r.status, JSON.stringify(headers)).toBe(201)
    }
    expect(await unitCount()).toBe(before + cases.length)
  })

  it('reads from anywhere as before: the check is on changes only', async () => {
    expect((await officer.request('GET', `/api/units/${ids.own.unit}`, undefined, { 'origin': 'http://evil.test', 'sec-fetch-site': 'cross-site' })).status).toBe(200)
  })
})
