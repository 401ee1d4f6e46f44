import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { ApiClient, accounts, database, fixtureIds, signIn } from '../support/api'
import { uploadPhoto } from '../support/photos'
import { routeFiles } from '../support/routes'
import { canAdminister, canAudit, canFit, canOversee, canRead, canRequestAudit } from '../../shared/access'
import type { RoleSet } from '../../shared/access'

// Built from the files under server/api: a new route with no entry here, or with no guard, fails.
type Role = 'admin' | 'officer' | 'installer' | 'manager'
type Param = 'site' | 'unit' | 'opening' | 'covering' | 'client' | 'user' | 'photo' | 'audit' | 'fix' | 'import' | 'recheck' | 'export' | 'mail'
interface Policy {
  public?: true
  roles?: RoleSet
  param?: Param
  body?: unknown
  // Ends the session: each call gets a fresh sign-in.
  endsSession?: true
}

const policies: Record<string, Policy> = {
  'GET /api/health': { public: true },
  'POST /api/auth/login': { public: true },
  'POST /api/auth/reset-request': { public: true },
  'POST /api/auth/reset': { public: true },
  'POST /api/auth/accept-invite': { public: true },
  'POST /api/auth/logout': { roles: canRead, endsSession: true },
  'GET /api/me': { roles: canRead },
  'GET /api/users': { roles: canAdminister },
  'POST /api/users': { roles: canAdminister },
  'PATCH /api/users/:id': { roles: canAdminister, param: 'user' },
  'GET /api/clients': { roles: canRead },
  'POST /api/clients': { roles: canAudit },
  'GET /api/clients/:id': { roles: canRead, param: 'client' },
  'PATCH /api/clients/:id': { roles: canAudit, param: 'client' },
  'GET /api/sites': { roles: canRead },
  'POST /api/sites': { roles: canAudit },
  'GET /api/sites/:id': { roles: canRead, param: 'site' },
  'PATCH /api/sites/:id': { roles: canAudit, param: 'site' },
  'GET /api/units': { roles: canRead },
  'POST /api/units': { roles: canFit },
  'GET /api/units/:id': { roles: canRead, param: 'unit' },
  'PATCH /api/units/:id': { roles: canFit, param: 'unit' },
  'GET /api/openings': { roles: canRead },
  'POST /api/openings': { roles: canFit },
  'GET /api/openings/:id': { roles: canRead, param: 'opening' },
  'PATCH /api/openings/:id': { roles: canFit, param: 'opening' },
  'GET /api/coverings': { roles: canRead },
  'POST /api/coverings': { roles: canFit },
  'GET /api/coverings/:id': { roles: canRead, param: 'covering' },
  'PATCH /api/coverings/:id': { roles: canFit, param: 'covering' },
  'GET /api/coverings/:id/label.pdf': { roles: canFit, param: 'covering' },
  'GET /api/sites/:id/labels.pdf': { roles: canFit, param: 'site' },
  'GET /api/sites/:id/report.pdf': { roles: canOversee, param: 'site' },
  'POST /api/sites/:id/report/email': { roles: canAudit, param: 'site' },
  'GET /api/sites/:id/reports': { roles: canOversee, param: 'site' },
  'GET /api/activity': { roles: canAudit },
  'GET /api/dev/mail': { roles: canAdminister },
  'GET /api/dev/mail/:id': { roles: canAdminister, param: 'mail' },
  'GET /api/dev/mail/:id/attachment': { roles: canAdminister, param: 'mail' },
  'GET /api/coverings/:id/photos': { roles: canRead, param: 'covering' },
  'POST /api/coverings/:id/photos': { roles: canFit, param: 'covering' },
  'POST /api/coverings/:id/inspections': { roles: canFit, param: 'covering', body: { measurements: {} } },
  'POST /api/coverings/:id/removal': { roles: canAudit, param: 'covering' },
  'GET /api/photos/:id': { roles: canRead, param: 'photo' },
  'GET /api/photos/:id/thumb': { roles: canRead, param: 'photo' },
  'GET /api/sites/:id/overview': { roles: canRead, param: 'site' },
  'GET /api/sites/:id/audits': { roles: canRead, param: 'site' },
  'POST /api/sites/:id/audits': { roles: canAudit, param: 'site' },
  'GET /api/audits/:id': { roles: canRead, param: 'audit' },
  'POST /api/audits/:id/close': { roles: canAudit, param: 'audit' },
  'POST /api/audits/:id/items': { roles: canAudit, param: 'audit' },
  'GET /api/team': { roles: canAudit },
  'GET /api/fixes': { roles: canRead },
  'GET /api/fixes/:id': { roles: canRead, param: 'fix' },
  'PATCH /api/fixes/:id': { roles: canAudit, param: 'fix', body: { dueOn: '2027-01-31' } },
  'GET /api/sites/:id/audit.csv': { roles: canOversee, param: 'site' },
  'GET /api/clients/:id/audit.csv': { roles: canOversee, param: 'client' },
  'GET /api/rules': { roles: canRead },
  'POST /api/checks': { roles: canRead },
  'GET /api/imports/template.csv': { roles: canOversee },
  'GET /api/imports': { roles: canOversee },
  'POST /api/imports': { roles: canOversee },
  'GET /api/imports/:id': { roles: canOversee, param: 'import' },
  'GET /api/imports/:id/errors': { roles: canOversee, param: 'import' },
  'POST /api/imports/:id/commit': { roles: canOversee, param: 'import' },
  'GET /api/rechecks': { roles: canOversee },
  'POST /api/rechecks': { roles: canOversee },
  'GET /api/rechecks/:id': { roles: canOversee, param: 'recheck' },
  'GET /api/rechecks/:id/changes': { roles: canOversee, param: 'recheck' },
  'POST /api/jobs/:id/cancel': { roles: canOversee, param: 'recheck' },
  'POST /api/exports': { roles: canOversee },
  'GET /api/exports/:id': { roles: canOversee, param: 'export' },
  'GET /api/exports/:id/file': { roles: canOversee, param: 'export' },
  'GET /api/portfolio/summary': { roles: canOversee },
  'GET /api/portfolio/units': { roles: canOversee },
  'GET /api/portfolio/coverings': { roles: canOversee },
  'POST /api/portfolio/audit-requests': { roles: canRequestAudit },
}

const routes = routeFiles()
let db: pg.Client
type Ids = Awaited<ReturnType<typeof fixtureIds>>
type Extra = { photo: number, audit: number, fix: number, import: number, recheck: number, export: number, mail: number }
let ids: { own: Ids['own'] & Extra, clientTwo: Ids['clientTwo'] & Extra, other: Ids['other'] & Extra }

// An audit and a remedy on each side of every boundary, for the audit and remedy routes.
async function auditOf(client: ApiClient, siteId: number) {
  const r = await client.post(`/api/sites/${siteId}/audits`)
  if (r.status > 201) throw new Error(`opening an audit failed: ${r.status} ${JSON.stringify(r.body)}`)
  return r.body.id as number
}
async function fixOf(siteId: number) {
  const r = await db.query('SELECT id FROM fixes WHERE site_id = $1 ORDER BY id LIMIT 1', [siteId])
  if (!r.rows[0]) {
    // The other workspace's demo covering passes; fail it once so it has a remedy.
    const { rows: [c] } = await db.query('SELECT id FROM coverings WHERE site_id = $1 ORDER BY id LIMIT 1', [siteId])
    const admin = await signIn(accounts.otherAdmin)
    const failing = { headHeightMm: 2300, lowestCordPointMm: 400, loopPullOutMm: 500, tensionDevice: false, breakaway: false, warningLabel: true, installerLabel: true, manufacturerLabel: true }
    const r2 = await admin.post(`/api/coverings/${c.id}/inspections`, { measurements: failing })
    if (r2.status !== 201) throw new Error(`could not fail the other workspace's covering: ${JSON.stringify(r2.body)}`)
    return fixOf(siteId)
  }
  return Number(r.rows[0].id)
}
// A recorded message of each workspace, for the Mailbox routes.
async function mailOf(siteId: number) {
  const r = await db.query(`INSERT INTO sent_mail (workspace_id, kind, recipients, subject, body_text, status)
    SELECT workspace_id, 'audit_request', ARRAY['matrix@example.com'], 'Access matrix', 'Access matrix', 'sent' FROM sites WHERE id = $1 RETURNING id`, [siteId])
  return Number(r.rows[0].id)
}
// An import (a dry run that changes nothing), a re-check and an export of each client, for the job routes.
async function jobsOf(client: ApiClient, clientId: number, siteRef: string, unitRef: string) {
  const form = new FormData()
  form.append('clientId', String(clientId))
  form.append('file', new Blob([`site_ref,unit_ref\n${siteRef},${unitRef}\n`]), 'matrix.csv')
  const imported = await client.request('POST', '/api/imports', form)
  const rechecked = await client.post('/api/rechecks', { scope: 'client', id: clientId })
  const exported = await client.post('/api/exports', { scope: 'client', id: clientId })
  for (const r of [imported, rechecked, exported]) if (r.status !== 202) throw new Error(`starting a job failed: ${r.status} ${JSON.stringify(r.body)}`)
  return { import: imported.body.id as number, recheck: rechecked.body.id as number, export: exported.body.id as number }
}
const clients: Partial<Record<Role, ApiClient>> = {}

beforeAll(async () => {
  db = await database()
  const base = await fixtureIds(db)
  for (const role of canRead) clients[role] = await signIn(accounts[role])
  // A photo on each side of every boundary, for the photo routes.
  const otherAdmin = await signIn(accounts.otherAdmin)
  ids = {
    own: { ...base.own, photo: (await uploadPhoto(clients.officer!, base.own.covering)).id, audit: await auditOf(clients.officer!, base.own.site), fix: await fixOf(base.own.site), mail: await mailOf(base.own.site),
      ...await jobsOf(clients.officer!, base.own.client, 'WAT', 'U1') },
    clientTwo: { ...base.clientTwo, photo: (await uploadPhoto(clients.officer!, base.clientTwo.covering)).id, audit: await auditOf(clients.officer!, base.clientTwo.site), fix: await fixOf(base.clientTwo.site), mail: await mailOf(base.clientTwo.site),
      ...await jobsOf(clients.officer!, base.clientTwo.client, 'SPR', 'R1') },
    other: { ...base.other, photo: (await uploadPhoto(otherAdmin, base.other.covering)).id, audit: await auditOf(otherAdmin, base.other.site), fix: await fixOf(base.other.site), mail: await mailOf(base.other.site),
      ...await jobsOf(otherAdmin, base.other.client, 'GRY', 'G1') },
  }
})
afterAll(async () => { await db?.end() })

function pathFor(key: string, param: Param | undefined, which: 'own' | 'other' | 'clientTwo') {
  const [, path] = key.split(' ') as [string, string]
  if (!param) return path
  const table = ids[which] as Record<string, number>
  const id = table[param] ?? ids.other[param as keyof typeof ids.other]
  return path.replace(':id', String(id))
}

async function call(role: Role | null, key: string, path: string, policy: Policy) {
  const method = key.split(' ')[0]!
  const client = role ? (policy.endsSession ? await signIn(accounts[role]) : clients[role]!) : new ApiClient()
  return client.request(method, path, method === 'GET' ? undefined : (policy.body ?? {}))
}

describe('access matrix: every file under server/api', () => {
  it('has a policy for every route file, and every file names its method', () => {
    const missing = routes.filter(r => !policies[r.key]).map(r => `${r.key} (server/api/${r.file})`)
    expect(missing, 'add these routes to the access matrix with their roles').toEqual([])
    expect(routes.length).toBeGreaterThanOrEqual(30)
  })

  for (const { key } of routes) {
    const policy = policies[key]
    if (!policy) continue
    describe(key, () => {
      it(policy.public ? 'answers anonymous callers (public)' : 'refuses anonymous callers with 401', async () => {
        const r = await call(null, key, pathFor(key, policy.param, 'own'), policy)
        if (policy.public) expect(r.status).not.toBe(401)
        else expect(r.status, JSON.stringify(r.body)).toBe(401)
      })
      if (!policy.public && policy.param) {
        // The session is checked before any record is looked up, so the answer says nothing about the id.
        it('refuses anonymous callers with 401 whatever the id: another tenant\'s, missing or malformed', async () => {
          const [, path] = key.split(' ') as [string, string]
          for (const id of [String((ids.other as Record<string, number>)[policy.param!]), '2147483647', 'abc']) {
            const r = await call(null, key, path.replace(':id', id), policy)
            expect(r.status, `${key} with id ${id}: ${JSON.stringify(r.body)}`).toBe(401)
          }
        })
      }
      if (policy.public) return
      it('lets each allowed role past the guard and refuses the others with 403', async () => {
        for (const role of canRead) {
          const r = await call(role, key, pathFor(key, policy.param, 'own'), policy)
          if (policy.roles!.includes(role)) {
            expect([401, 403], `${role} on ${key}: ${JSON.stringify(r.body)}`).not.toContain(r.status)
            expect(r.status, `${role} on ${key}`).toBeLessThan(500)
          }
          else {
            expect(r.status, `${role} on ${key}: ${JSON.stringify(r.body)}`).toBe(403)
          }
        }
      })
      if (policy.param) {
        it('answers 404 for another workspace\'s record, and a manager for another client\'s', async () => {
          for (const role of policy.roles!) {
            const other = await call(role, key, pathFor(key, policy.param, 'other'), policy)
            expect(other.status, `${role} on another workspace's ${policy.param}`).toBe(404)
            if (role === 'manager' && policy.param !== 'user') {
              const two = await call(role, key, pathFor(key, policy.param, 'clientTwo'), policy)
              expect(two.status, `manager on client two's ${policy.param}`).toBe(404)
            }
          }
        })
      }
      if (key.startsWith('GET') && !policy.param && ['sites', 'units', 'openings', 'coverings', 'clients'].some(r => key.endsWith(`/api/${r}`))) {
        it('lists nothing from another workspace, and a manager nothing from another client', async () => {
          for (const role of policy.roles!) {
            const r = await call(role, key, `${pathFor(key, undefined, 'own')}?pageSize=100`, policy)
            expect(r.status).toBe(200)
            const found = r.body.items as Array<{ id: number, siteId?: number, clientId?: number }>
            const resource = key.split('/').pop() as string
            const otherId = { sites: ids.other.site, units: ids.other.unit, openings: ids.other.opening, coverings: ids.other.covering, clients: ids.other.client }[resource]!
            expect(found.some(i => i.id === otherId), `${role} sees another workspace in ${key}`).toBe(false)
            if (role === 'manager') {
              const twoId = { sites: ids.clientTwo.site, units: ids.clientTwo.unit, openings: ids.clientTwo.opening, coverings: ids.clientTwo.covering, clients: ids.clientTwo.client }[resource]!
              expect(found.some(i => i.id === twoId), `manager sees client two in ${key}`).toBe(false)
            }
          }
        })
      }
    })
  }
})
