import { randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { uploadPhoto } from '../support/photos'

// What the register says was measured, by whom and when, and why a verdict moved, must hold under use.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let admin: ApiClient, officer: ApiClient, installer: ApiClient

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  admin = await signIn(accounts.admin)
  officer = await signIn(accounts.officer)
  installer = await signIn(accounts.installer)
})
afterAll(async () => { await db.end() })

let seq = 0
/** A fresh chain-loop roller in a bedroom of Wattle Court (AU, rental home), so each test starts from nothing. */
async function freshCovering(fields: Record<string, unknown> = {}) {
  const tag = `${Date.now().toString(36)}${++seq}`.toUpperCase()
  const unit = await admin.post('/api/units', { siteId: ids.own.site, ref: `EV-${tag}` })
  const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: 'Bedroom', recessWidthMm: 900, recessHeightMm: 1200 })
  const covering = await admin.post('/api/coverings', { openingId: opening.body.id, ref: `EV-${tag}-1`, productType: 'roller', control: 'chain_loop',
    madeTo: 'custom', installedOn: '2025-05-01', widthMm: 880, dropMm: 1200, ...fields })
  if (covering.status !== 201) throw new Error(`fixture covering failed: ${JSON.stringify(covering.body)}`)
  return covering.body.id as number
}

// AS/NZS 60335.2.97 / ACCC mandatory standard (as the AU rule set cites it): a loose loop hanging to 300 mm fails.
const hanging = { headHeightMm: 1500, lowestCordPointMm: 300, loopPullOutMm: 600, loopPerimeterMm: 1800, tensionDevice: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true }
// The same covering put right: a short loop (150 mm, under the AU rule set's 220 mm) 900 mm up, labelled.
const putRight = { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 150, loopPerimeterMm: 300, tensionDevice: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true }
const tensioned = { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900,
  tensionDeviceHoldN: 80, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false }

const signOff = (client: ApiClient, id: number, body: Record<string, unknown>) => client.post(`/api/coverings/${id}/inspections`, body)
const openFixes = async (id: number) => Number((await db.query(`SELECT count(*) AS n FROM fixes WHERE covering_id = $1 AND status = 'open'`, [id])).rows[0].n)
const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000).toISOString()

/** An older upload stored before photos were decoded: no pixel size recorded. */
async function undecodedPhoto(coveringId: number, kind: string) {
  const { rows: [c] } = await db.query('SELECT c.site_id, s.workspace_id FROM coverings c JOIN sites s ON s.id = c.site_id WHERE c.id = $1', [coveringId])
  const uploader = await db.query('SELECT id FROM users WHERE email = $1', [accounts.installer])
  const { rows: [p] } = await db.query(`INSERT INTO photos (workspace_id, site_id, covering_id, kind, object_key, content_type, size_bytes, sha256, uploaded_by, width_px, height_px)
    VALUES ($1, $2, $3, $4, $5, 'image/jpeg', 1234, $6, $7, NULL, NULL) RETURNING id`,
  [c.workspace_id, c.site_id, coveringId, kind, `legacy/${randomBytes(8).toString('hex')}.jpg`, randomBytes(32).toString('hex'), uploader.rows[0].id])
  return Number(p.id)
}

describe('a clientKey replays only the same person\'s same sign-off', () => {
  it('answers 409 naming clientKey when another user reuses the key, and reveals nothing of the first', async () => {
    const id = await freshCovering()
    const body = { measurements: hanging, clientKey: `key-${Date.now()}-a` }
    const first = await signOff(installer, id, body)
    expect(first.status).toBe(201)
    const other = await signOff(officer, id, body)
    expect(other.status).toBe(409)
    expect(other.body.message).toMatch(/^clientKey/)
    expect(other.body.id).toBeUndefined()
    expect(Object.keys(other.body.data.fields)).toEqual(['clientKey'])
    expect(JSON.stringify(other.body)).not.toMatch(/non_compliant|verdict|inspectedAt|#\d/)
    const same = await signOff(installer, id, body)
    expect(same.status).toBe(200)
    expect(same.body).toMatchObject({ id: first.body.id, replayed: true })
  })

  it('answers 409 when the same user sends other measurements under the same key', async () => {
    const id = await freshCovering()
    const key = `key-${Date.now()}-b`
    expect((await signOff(installer, id, { measurements: hanging, clientKey: key })).status).toBe(201)
    const changed = await signOff(installer, id, { measurements: { ...hanging, loopPullOutMm: 120 }, clientKey: key })
    expect(changed.status).toBe(409)
    expect(changed.body.data.fields.clientKey).toBeTruthy()
    expect(Number((await db.query('SELECT count(*) AS n FROM inspections WHERE covering_id = $1', [id])).rows[0].n)).toBe(1)
  })

  it('replays the same body sent with its keys in another order', async () => {
    const id = await freshCovering()
    const key = `key-${Date.now()}-c`
    const first = await signOff(installer, id, { measurements: hanging, clientKey: key, notes: 'Loop hanging free' })
    const reordered = Object.fromEntries(Object.entries(hanging).reverse())
    const again = await signOff(installer, id, { notes: 'Loop hanging free', clientKey: key, measurements: reordered })
    expect(again.status).toBe(200)
    expect(again.body.id).toBe(first.body.id)
  })
})

describe('an audit or correction names what it belongs to', () => {
  it('refuses kind audit without an open audit of the site, naming auditId', async () => {
    const id = await freshCovering()
    const none = await signOff(officer, id, { kind: 'audit', measurements: hanging })
    expect(none.status).toBe(400)
    expect(none.body.message).toMatch(/^auditId/)
    const elsewhere = await officer.post(`/api/sites/${ids.clientTwo.site}/audits`)
    const wrongSite = await signOff(officer, id, { kind: 'audit', auditId: elsewhere.body.id, measurements: hanging })
    expect(wrongSite.status).toBe(400)
    expect(wrongSite.body.data.fields.auditId).toBeTruthy()
  })

  it('refuses kind correction without an inspection of this covering, naming correctsId', async () => {
    const id = await freshCovering()
    const none = await signOff(installer, id, { kind: 'correction', measurements: hanging })
    expect(none.status).toBe(400)
    expect(none.body.message).toMatch(/^correctsId/)
    const { rows: [foreign] } = await db.query('SELECT id FROM inspections WHERE covering_id <> $1 ORDER BY id LIMIT 1', [id])
    const notOurs = await signOff(installer, id, { kind: 'correction', correctsId: foreign.id, measurements: hanging })
    expect(notOurs.status).toBe(400)
    expect(notOurs.body.message).toMatch(/^correctsId/)
    expect(Number((await db.query('SELECT count(*) AS n FROM inspections WHERE covering_id = $1', [id])).rows[0].n)).toBe(0)
  })
})

describe('a visit is dated within bounds', () => {
  it('refuses a visit years ago, or in year 1, naming inspectedAt', async () => {
    const id = await freshCovering()
    for (const inspectedAt of ['2020-03-01T09:00:00Z', '0001-01-01T00:00:00Z']) {
      const r = await signOff(installer, id, { measurements: putRight, inspectedAt })
      expect(r.status, inspectedAt).toBe(400)
      expect(r.body.message).toMatch(/^inspectedAt: a visit may be dated at most 14 days/)
    }
    expect((await signOff(installer, id, { measurements: putRight, inspectedAt: hoursAgo(72) })).status).toBe(201)
  })

  it('refuses a passing visit dated before the failing one, and the remedy stays open', async () => {
    const id = await freshCovering()
    const failing = await signOff(installer, id, { measurements: hanging })
    expect(failing.body.verdict).toBe('non_compliant')
    expect(await openFixes(id)).toBeGreaterThan(0)
    const photo = await uploadPhoto(installer, id, 'whole')
    const earlier = await signOff(installer, id, { measurements: putRight, photoIds: [photo.id], inspectedAt: hoursAgo(2) })
    expect(earlier.status).toBe(400)
    expect(earlier.body.message).toMatch(/^inspectedAt: this covering was last inspected at/)
    expect(await openFixes(id)).toBeGreaterThan(0)
    expect((await db.query('SELECT last_verdict FROM coverings WHERE id = $1', [id])).rows[0].last_verdict).toBe('non_compliant')
  })

  it('closes a remedy only through a visit later than the one that raised it', async () => {
    const id = await freshCovering()
    const at = hoursAgo(1)
    expect((await signOff(installer, id, { measurements: hanging, inspectedAt: at })).status).toBe(201)
    const photo = await uploadPhoto(installer, id, 'whole')
    const sameMoment = await signOff(installer, id, { measurements: putRight, photoIds: [photo.id], inspectedAt: at })
    expect(sameMoment.status).toBe(201)
    expect(await openFixes(id)).toBeGreaterThan(0)
    const later = await signOff(installer, id, { measurements: putRight, photoIds: [photo.id] })
    expect(later.body.verdict).toBe('compliant')
    expect(await openFixes(id)).toBe(0)
  })
})

describe('only a decoded photo is evidence', () => {
  it('does not take an undecoded tension-device photo as the photo of the fitted device', async () => {
    const id = await freshCovering()
    const legacy = await undecodedPhoto(id, 'tension_device')
    const r = await signOff(installer, id, { measurements: tensioned, photoIds: [legacy] })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^photoIds: a covering with a tension device needs a photo/)
    const decoded = await uploadPhoto(installer, id, 'tension_device')
    expect((await signOff(installer, id, { measurements: tensioned, photoIds: [legacy, decoded.id] })).status).toBe(201)
  })

  it('does not close a remedy with an undecoded photo', async () => {
    const id = await freshCovering()
    expect((await signOff(installer, id, { measurements: hanging, inspectedAt: hoursAgo(1) })).status).toBe(201)
    const legacy = await undecodedPhoto(id, 'whole')
    const r = await signOff(installer, id, { measurements: putRight, photoIds: [legacy] })
    expect(r.status).toBe(201)
    expect(r.body.verdict).toBe('compliant')
    expect(await openFixes(id)).toBeGreaterThan(0)
  })
})
