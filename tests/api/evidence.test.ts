import { execFile } from 'node:child_process'
import { createHash, randomBytes } from 'node:crypto'
import { rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { PutObjectCommand, S3Client } from '@aws-sdk/client-s3'
import { parse } from 'csv-parse/sync'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { uploadPhoto } from '../support/photos'
import { formatDay } from '../../server/services/report'

// What the register says was measured, by whom and when, and why a verdict moved, must hold under use.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let admin: ApiClient, officer: ApiClient, installer: ApiClient
/** A site of this file's own (AU, rental home), so its coverings never change the demo sites other files count. */
let siteId: number

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  admin = await signIn(accounts.admin)
  officer = await signIn(accounts.officer)
  installer = await signIn(accounts.installer)
  const site = await admin.post('/api/sites', { clientId: ids.own.client, ref: `EVS-${Date.now().toString(36).toUpperCase()}`, name: 'Marrow Lane Flats',
    address: '12 Marrow Lane, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home' })
  if (site.status !== 201) throw new Error(`fixture site failed: ${JSON.stringify(site.body)}`)
  siteId = site.body.id as number
})
afterAll(async () => { await db.end() })

let seq = 0
/** A fresh chain-loop roller in a bedroom of this file's site (AU, rental home), so each test starts from nothing. */
async function freshCovering(fields: Record<string, unknown> = {}) {
  const tag = `${Date.now().toString(36)}${++seq}`.toUpperCase()
  const unit = await admin.post('/api/units', { siteId, ref: `EV-${tag}` })
  const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: 'Bedroom', recessWidthMm: 900, recessHeightMm: 1200 })
  const covering = await admin.post('/api/coverings', { openingId: opening.body.id, ref: `EV-${tag}-1`, productType: 'roller', control: 'chain_loop',
    madeTo: 'custom', installedOn: '2025-05-01', widthMm: 880, dropMm: 1200, ...fields })
  if (covering.status !== 201) throw new Error(`fixture covering failed: ${JSON.stringify(covering.body)}`)
  return covering.body.id as number
}

// AS/NZS 60335.2.97 / ACCC mandatory standard (as the AU rule set cites it): a loose loop hanging to 300 mm fails.
const hanging = { headHeightMm: 1500, lowestCordPointMm: 300, loopPullOutMm: 600, loopPerimeterMm: 1800, tensionDevice: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, installedPerInstructions: true }
// The same covering put right: a short loop (150 mm, under the AU rule set's 220 mm) 900 mm up, labelled.
const putRight = { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 150, loopPerimeterMm: 300, tensionDevice: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, installedPerInstructions: true }
const tensioned = { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900,
  tensionDeviceHoldN: 80, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false, installedPerInstructions: true }

const signOff = (client: ApiClient, id: number, body: Record<string, unknown>) => client.post(`/api/coverings/${id}/inspections`, body)
const openFixes = async (id: number) => Number((await db.query(`SELECT count(*) AS n FROM fixes WHERE covering_id = $1 AND status = 'open'`, [id])).rows[0].n)
const hoursAgo = (h: number) => new Date(Date.now() - h * 3_600_000).toISOString()

/** An older upload stored before photos were decoded: no pixel size recorded. */
async function undecodedPhoto(coveringId: number, kind: string) {
  const { rows: [c] } = await db.query('SELECT c.site_id, s.workspace_id FROM coverings c JOIN sites s ON s.id = c.site_id WHERE c.id = $1', [coveringId])
  const uploader = await db.query('SELECT id FROM users WHERE email = $1', [accounts.installer])
  // Its bytes are stored like any photo's (backups copy every photo's object), but the row never recorded a decoded size.
  const bytes = randomBytes(1234)
  const objectKey = `legacy/${randomBytes(8).toString('hex')}.jpg`
  const s3 = new S3Client({
    endpoint: process.env.S3_ENDPOINT, region: process.env.S3_REGION ?? 'us-east-1', forcePathStyle: true,
    credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' },
  })
  await s3.send(new PutObjectCommand({ Bucket: process.env.S3_BUCKET ?? 'tautline-photos', Key: objectKey, Body: bytes, ContentType: 'image/jpeg' }))
  // New rows must carry a decoded size (photos_decoded_size); an older row is made as it was before that check.
  await db.query('BEGIN')
  try {
    await db.query('ALTER TABLE photos DROP CONSTRAINT photos_decoded_size')
    const { rows: [p] } = await db.query(`INSERT INTO photos (workspace_id, site_id, covering_id, kind, object_key, content_type, size_bytes, sha256, uploaded_by, width_px, height_px)
      VALUES ($1, $2, $3, $4, $5, 'image/jpeg', 1234, $6, $7, NULL, NULL) RETURNING id`,
    [c.workspace_id, c.site_id, coveringId, kind, objectKey, createHash('sha256').update(bytes).digest('hex'), uploader.rows[0].id])
    await db.query(`ALTER TABLE photos ADD CONSTRAINT photos_decoded_size
      CHECK (width_px IS NOT NULL AND height_px IS NOT NULL AND width_px > 0 AND height_px > 0) NOT VALID`)
    await db.query('COMMIT')
    return Number(p.id)
  }
  catch (err) {
    await db.query('ROLLBACK')
    throw err
  }
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

describe('a verdict moves only through evidence', () => {
  it('an edit of the control after a failing inspection keeps the verdict and remedies, marks the covering, and a re-check reads the inspection', async () => {
    const id = await freshCovering()
    expect((await signOff(installer, id, { measurements: hanging })).body.verdict).toBe('non_compliant')
    const remediesBefore = await openFixes(id)
    const edit = await installer.patch(`/api/coverings/${id}`, { control: 'cordless' })
    expect(edit.status).toBe(200)
    const read = await officer.get(`/api/coverings/${id}`)
    expect(read.body).toMatchObject({ control: 'cordless', lastVerdict: 'non_compliant', changedSinceInspection: true, changedFields: ['covering.control'] })
    expect(await openFixes(id)).toBe(remediesBefore)
    const listed = await officer.get(`/api/coverings?siteId=${siteId}&q=${read.body.ref}`)
    expect(listed.body.items[0]).toMatchObject({ changedSinceInspection: true })

    const recheck = await officer.post('/api/rechecks', { scope: 'site', id: siteId })
    expect(recheck.status).toBe(202)
    for (let i = 0; i < 100; i++) {
      const job = await officer.get(`/api/rechecks/${recheck.body.id}`)
      if (['succeeded', 'failed'].includes(job.body.status)) { expect(job.body.status).toBe('succeeded'); break }
      await new Promise(r => setTimeout(r, 200))
    }
    const { rows: [result] } = await db.query('SELECT verdict, inspection_id FROM check_results WHERE job_id = $1 AND covering_id = $2', [recheck.body.id, id])
    expect(result.verdict).toBe('non_compliant')
    expect((await db.query('SELECT last_verdict FROM coverings WHERE id = $1', [id])).rows[0].last_verdict).toBe('non_compliant')
    expect(await openFixes(id)).toBe(remediesBefore)
  })

  it('an edit of a room flag or the site premises marks the coverings fed by it; an edit before any inspection marks nothing', async () => {
    const id = await freshCovering()
    expect((await signOff(installer, id, { measurements: putRight })).status).toBe(201)
    const { rows: [c] } = await db.query('SELECT opening_id FROM coverings WHERE id = $1', [id])
    expect((await installer.patch(`/api/openings/${c.opening_id}`, { childrensRoom: true })).status).toBe(200)
    expect((await officer.get(`/api/coverings/${id}`)).body).toMatchObject({ changedSinceInspection: true, changedFields: ['opening.childrensRoom'], lastVerdict: 'compliant' })
    const untouched = await freshCovering()
    expect((await installer.patch(`/api/coverings/${untouched}`, { control: 'wand', madeTo: 'stock' })).status).toBe(200)
    expect((await officer.get(`/api/coverings/${untouched}`)).body.changedSinceInspection).toBe(false)
    // A field the rules do not read (the maker's model) leaves the flag alone.
    const other = await freshCovering()
    expect((await signOff(installer, other, { measurements: putRight })).status).toBe(201)
    expect((await installer.patch(`/api/coverings/${other}`, { makerModel: 'Shade 40' })).status).toBe(200)
    expect((await officer.get(`/api/coverings/${other}`)).body.changedSinceInspection).toBe(false)
  })

  it('a sign-off carries the covering\'s changed control in the same transaction: refused, nothing changes; saved, both change and the mark clears', async () => {
    const id = await freshCovering()
    expect((await signOff(installer, id, { measurements: hanging })).status).toBe(201)
    // A tension device with no photo of it is refused: the control must stay as it was.
    const refused = await signOff(installer, id, { measurements: tensioned, covering: { control: 'cord_loop' } })
    expect(refused.status).toBe(400)
    expect((await db.query('SELECT control FROM coverings WHERE id = $1', [id])).rows[0].control).toBe('chain_loop')
    const badField = await signOff(installer, id, { measurements: putRight, covering: { control: 'teleport' } })
    expect(badField.status).toBe(400)
    expect(badField.body.message).toMatch(/^covering\.control/)
    expect((await installer.patch(`/api/coverings/${id}`, { madeTo: 'stock' })).status).toBe(200)
    const saved = await signOff(installer, id, { measurements: { headHeightMm: 2100, warningLabel: true, installerLabel: true, manufacturerLabel: true }, covering: { control: 'cordless' } })
    expect(saved.status, JSON.stringify(saved.body)).toBe(201)
    const read = await officer.get(`/api/coverings/${id}`)
    expect(read.body).toMatchObject({ control: 'cordless', changedSinceInspection: false, changedFields: [], lastInspectionId: saved.body.id })
    expect(read.body.inspections[0].record.control).toBe('cordless')
    const log = await db.query(`SELECT action, detail FROM activity_log WHERE entity = 'covering' AND entity_id = $1 ORDER BY id`, [id])
    expect(log.rows.some(r => r.action === 'covering.updated' && r.detail.withInspection === true && r.detail.after.control === 'cordless')).toBe(true)
  })
})

describe('removal is a recorded act', () => {
  it('a PATCH can no longer set status: it names status and changes nothing', async () => {
    const id = await freshCovering()
    const r = await installer.patch(`/api/coverings/${id}`, { status: 'removed' })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^status/)
    expect((await db.query('SELECT status FROM coverings WHERE id = $1', [id])).rows[0].status).toBe('in_place')
  })

  it('needs an officer or admin and a reason', async () => {
    const id = await freshCovering()
    expect((await installer.post(`/api/coverings/${id}/removal`, { reason: 'Taken down' })).status).toBe(403)
    const noReason = await officer.post(`/api/coverings/${id}/removal`, {})
    expect(noReason.status).toBe(400)
    expect(noReason.body.message).toMatch(/^reason/)
    const legacy = await undecodedPhoto(id, 'whole')
    const badPhoto = await officer.post(`/api/coverings/${id}/removal`, { reason: 'Taken down', photoId: legacy })
    expect(badPhoto.status).toBe(400)
    expect(badPhoto.body.message).toMatch(/^photoId/)
    expect((await db.query('SELECT status FROM coverings WHERE id = $1', [id])).rows[0].status).toBe('in_place')
  })

  it('records who, when, why, the photo and the replacement, closes open remedies with it, and keeps the covering in the history and CSV', async () => {
    const id = await freshCovering()
    const replacement = await freshCovering({ control: 'cordless' })
    expect((await signOff(installer, id, { measurements: hanging })).body.verdict).toBe('non_compliant')
    const open = await openFixes(id)
    expect(open).toBeGreaterThan(0)
    const photo = await uploadPhoto(officer, id, 'defect')
    const r = await officer.post(`/api/coverings/${id}/removal`, { reason: 'Chain-loop blind taken down; cordless cellular fitted', photoId: photo.id, replacedById: replacement })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body).toMatchObject({ coveringId: id, photoId: photo.id, replacedById: replacement, closedRemedies: open })
    const { rows: [row] } = await db.query('SELECT * FROM covering_removals WHERE covering_id = $1', [id])
    expect(row).toMatchObject({ reason: 'Chain-loop blind taken down; cordless cellular fitted', photo_id: photo.id, replaced_by: replacement })
    const fixes = await db.query('SELECT status, closed_by_removal_id FROM fixes WHERE covering_id = $1', [id])
    expect(fixes.rows.every(f => f.status === 'closed' && f.closed_by_removal_id === row.id)).toBe(true)
    const listed = await officer.get(`/api/fixes?coveringId=${id}&status=closed`)
    expect(listed.body.items[0]).toMatchObject({ status: 'closed', closedByInspectionId: null, closedByRemoval: { reason: row.reason } })
    const read = await officer.get(`/api/coverings/${id}`)
    expect(read.body).toMatchObject({ status: 'removed', lastVerdict: 'non_compliant', removal: { reason: row.reason, removedByName: 'Dev Okonjo', replacedById: replacement } })
    expect(read.body.inspections).toHaveLength(1)
    const log = await db.query(`SELECT action FROM activity_log WHERE entity = 'covering' AND entity_id = $1`, [id])
    expect(log.rows.map(l => l.action)).toContain('covering.removed')
    const csv = await officer.request('GET', `/api/sites/${siteId}/audit.csv`, undefined, { accept: 'text/csv' })
    const csvRows = parse(String(csv.body), { bom: true, columns: true }) as Array<Record<string, string>>
    expect(csvRows.find(x => x.covering_ref === read.body.ref)).toMatchObject({ status: 'removed', removed_by: 'Dev Okonjo',
      removal_reason: 'Chain-loop blind taken down; cordless cellular fitted', removed_on: new Date().toISOString().slice(0, 10), verdict: 'non_compliant' })
    const visit = await signOff(installer, id, { measurements: putRight })
    expect(visit.status).toBe(400)
    expect(visit.body.message).toMatch(/^status: this covering is recorded as removed/)
    const again = await officer.post(`/api/coverings/${id}/removal`, { reason: 'Twice' })
    expect(again.status).toBe(409)
    await expect(db.query(`UPDATE covering_removals SET reason = 'edited' WHERE id = $1`, [row.id])).rejects.toThrow(/evidence/)
  })
})

describe('the deliverables tell who measured, who confirmed, what an audit could not reach, and what was removed', () => {
  it('the landlord PDF and the audit CSV keep measured-by apart from confirmed-by, list not-accessible coverings with reasons, and removals', async () => {
    const tag = Date.now().toString(36).toUpperCase()
    const site = await admin.post('/api/sites', { clientId: ids.own.client, ref: `AUD-${tag}`, name: 'Quillon Terrace', address: '4 Quillon Terrace, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home' })
    expect(site.status, JSON.stringify(site.body)).toBe(201)
    const unit = await admin.post('/api/units', { siteId: site.body.id, ref: '1' })
    const make = async (n: number, room: string) => {
      const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: `W${n}`, room })
      return (await admin.post('/api/coverings', { openingId: opening.body.id, ref: `QT-${n}`, productType: 'roller', control: 'chain_loop', madeTo: 'custom', installedOn: '2025-05-01' })).body.id as number
    }
    const [confirmedId, remeasuredId, lockedId, removedId] = [await make(1, 'Living'), await make(2, 'Kitchen'), await make(3, 'Bedroom 1'), await make(4, 'Bedroom 2')]
    const twoDaysAgo = hoursAgo(48)
    for (const id of [confirmedId, remeasuredId, lockedId, removedId]) expect((await signOff(installer, id, { measurements: hanging, inspectedAt: twoDaysAgo })).status).toBe(201)
    expect((await officer.post(`/api/coverings/${removedId}/removal`, { reason: 'Blind taken down by the owner; window left bare' })).status).toBe(201)

    const audit = await officer.post(`/api/sites/${site.body.id}/audits`)
    expect(audit.status).toBe(201)
    expect((await officer.post(`/api/audits/${audit.body.id}/items`, { coveringId: confirmedId, status: 'confirmed' })).status).toBe(200)
    expect((await signOff(officer, remeasuredId, { auditId: audit.body.id, measurements: { ...hanging, loopPullOutMm: 650 } })).status).toBe(201)
    expect((await officer.post(`/api/audits/${audit.body.id}/items`, { coveringId: lockedId, status: 'not_accessible', reason: 'Tenant refused entry to the bedroom' })).status).toBe(200)
    expect((await officer.post(`/api/audits/${audit.body.id}/close`, {})).status).toBe(200)

    // The covering page says the same.
    const page = await officer.get(`/api/coverings/${confirmedId}`)
    expect(page.body.inspections[0]).toMatchObject({ kind: 'audit', inspectorName: 'Dev Okonjo', measuredByName: 'Sam Ferrow', measuredAt: new Date(twoDaysAgo).toISOString() })

    const csv = await officer.request('GET', `/api/sites/${site.body.id}/audit.csv`, undefined, { accept: 'text/csv' })
    const rows = parse(String(csv.body), { bom: true, columns: true }) as Array<Record<string, string>>
    const byRef = Object.fromEntries(rows.map(r => [r.covering_ref, r]))
    const measuredOn = twoDaysAgo.slice(0, 10)
    const todayOn = new Date().toISOString().slice(0, 10)
    expect(byRef['QT-1']).toMatchObject({ audit_id: String(audit.body.id), audit_outcome: 'confirmed_unchanged', measured_by: 'Sam Ferrow', measured_on: measuredOn,
      confirmed_by: 'Dev Okonjo', confirmed_on: todayOn, loop_pull_out_mm: '600' })
    expect(byRef['QT-2']).toMatchObject({ audit_outcome: 'measured', measured_by: 'Dev Okonjo', measured_on: todayOn, confirmed_by: '', loop_pull_out_mm: '650' })
    expect(byRef['QT-3']).toMatchObject({ audit_outcome: 'not_accessible', audit_note: 'Tenant refused entry to the bedroom', measured_by: 'Sam Ferrow', confirmed_by: '' })
    expect(byRef['QT-4']).toMatchObject({ status: 'removed', removed_by: 'Dev Okonjo', removal_reason: 'Blind taken down by the owner; window left bare', audit_id: '' })

    const res = await fetch(`${process.env.TEST_BASE_URL}/api/sites/${site.body.id}/report.pdf`, { headers: { cookie: officer.cookie! } })
    expect(res.status).toBe(200)
    const file = join(tmpdir(), `tautline-audit-report-${tag}.pdf`)
    await writeFile(file, new Uint8Array(await res.arrayBuffer()))
    const text = (await promisify(execFile)('pdftotext', ['-enc', 'UTF-8', file, '-'])).stdout.replace(/\s+/g, ' ')
    await rm(file, { force: true })
    const day = (iso: string) => formatDay(iso.slice(0, 10))
    expect(text).toContain(`Measured ${day(twoDaysAgo)} by Sam Ferrow; confirmed unchanged at audit ${day(todayOn)} by Dev Okonjo`)
    expect(text).toContain(`Audit: measured ${day(todayOn)} by Dev Okonjo`)
    expect(text).not.toMatch(/\(audit, Dev Okonjo\)/)
    expect(text).toContain('1 covering re-measured, 1 confirmed unchanged')
    expect(text).toContain('Not accessible at the audit')
    expect(text).toContain('QT-3 (Unit 1, Bedroom 1): Tenant refused entry to the bedroom')
    expect(text).toContain('Not accessible at audit')
    expect(text).toContain('Removed in the register (no report has been sent before)')
    expect(text).toContain('QT-4 (Unit 1, Bedroom 2), removed')
    expect(text).toContain('Reason: Blind taken down by the owner; window left bare')
  })
})
