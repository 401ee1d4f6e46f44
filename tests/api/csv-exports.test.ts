import { parse } from 'csv-parse/sync'
import { beforeAll, describe, expect, it } from 'vitest'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { settled } from '../support/jobs'

// Every CSV the register hands out neutralises a cell that a spreadsheet would run as a formula (OWASP's CSV
// injection advice): text starting with = + - @ or a tab or carriage return gets a leading apostrophe.

const dangerous = /^[=+\-@\t\r]/
const numeric = /^-?\d+(\.\d+)?$/

function formulaCells(csv: string) {
  const rows = parse(csv, { bom: true, relax_column_count: true }) as string[][]
  return rows.flat().filter(cell => dangerous.test(cell) && !numeric.test(cell))
}

describe('CSV formula neutralisation', () => {
  let admin: ApiClient
  let siteId = 0
  let clientId = 0
  const planted = { site: '=SUM(A1:A9)', unit: '@cmd', room: '+1+1', maker: '-2+3 Cord Co', notes: '\tTabbed' }

  beforeAll(async () => {
    const db = await database()
    clientId = (await fixtureIds(db)).own.client
    await db.end()
    admin = await signIn(accounts.admin)
    const tag = Date.now().toString(36).toUpperCase()
    const site = await admin.post('/api/sites', { clientId, ref: `CSV-${tag}`, name: planted.site, address: '@1 Formula Lane', jurisdiction: 'AU', premises: 'rental_home', notes: planted.notes })
    expect(site.status, JSON.stringify(site.body)).toBe(201)
    siteId = site.body.id
    const unit = await admin.post('/api/units', { siteId, ref: 'U1', name: planted.unit })
    expect(unit.status, JSON.stringify(unit.body)).toBe(201)
    const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: planted.room, recessWidthMm: 1200, recessHeightMm: 1500 })
    expect(opening.status, JSON.stringify(opening.body)).toBe(201)
    const covering = await admin.post('/api/coverings', { openingId: opening.body.id, ref: `CSV-${tag}-1`, productType: 'roller', control: 'chain_loop', widthMm: 1180, dropMm: 1500, makerModel: planted.maker })
    expect(covering.status, JSON.stringify(covering.body)).toBe(201)
  })

  it('holds for the site and client audit files and for an export built as a job', async () => {
    const files: Record<string, string> = {}
    for (const path of [`/api/sites/${siteId}/audit.csv`, `/api/clients/${clientId}/audit.csv`]) {
      const r = await admin.request('GET', path, undefined, { accept: 'text/csv' })
      expect(r.status, path).toBe(200)
      files[path] = String(r.body)
    }
    const job = await admin.post('/api/exports', { scope: 'site', id: siteId })
    expect(job.status, JSON.stringify(job.body)).toBe(202)
    const done = await settled(admin, `/api/exports/${job.body.id}`)
    expect(done.status, done.error).toBe('succeeded')
    const file = await admin.get(done.fileUrl)
    expect(file.status).toBe(200)
    files['export job'] = String(file.body)
    const template = await admin.request('GET', '/api/imports/template.csv', undefined, { accept: 'text/csv' })
    files['import template'] = String(template.body)

    for (const [what, csv] of Object.entries(files)) {
      expect(formulaCells(csv), what).toEqual([])
      if (what === 'import template') continue
      const cells = new Set((parse(csv, { bom: true, relax_column_count: true }) as string[][]).flat())
      for (const value of [planted.site, planted.unit, planted.room, planted.maker]) {
        if ([...cells].some(c => c.includes(value.trim()))) expect(cells.has(`'${value}`), `${what} neutralises ${value}`).toBe(true)
      }
      expect(cells.has(`'${planted.site}`), `${what} lists the site`).toBe(true)
    }
  })
})
