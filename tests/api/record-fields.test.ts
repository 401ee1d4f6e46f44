import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { uploadPhoto } from '../support/photos'

// The record fields of the rulebook's second edition go through sign-off as measured, under the rulebook schema,
// and the register (the room's child's-room flag included) decides what is not measured.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let admin: ApiClient, installer: ApiClient, officer: ApiClient
const sites: Record<string, number> = {}

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  admin = await signIn(accounts.admin)
  installer = await signIn(accounts.installer)
  officer = await signIn(accounts.officer)
  // Sites of their own, so the demo sites' counts stay as other tests expect them.
  for (const [ref, jurisdiction] of [['RFX-AU', 'AU'], ['RFX-EU', 'EU'], ['RFX-CA', 'CA']] as const) {
    const site = await admin.post('/api/sites', { clientId: ids.own.client, ref, name: `Record fields ${jurisdiction}`, address: `1 Field Street, ${jurisdiction}`, jurisdiction, premises: 'rental_home' })
    if (site.status !== 201) throw new Error(`fixture site failed: ${JSON.stringify(site.body)}`)
    sites[jurisdiction] = site.body.id
  }
})
afterAll(async () => { await db.end() })

let seq = 0
async function freshCovering(jurisdiction: 'AU' | 'EU' | 'CA', fields: Record<string, unknown>, room: Record<string, unknown> = {}) {
  const tag = `${Date.now().toString(36)}${++seq}`.toUpperCase()
  const unit = await admin.post('/api/units', { siteId: sites[jurisdiction], ref: `RF-${tag}` })
  const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: 'Bedroom', ...room })
  const covering = await admin.post('/api/coverings', { openingId: opening.body.id, ref: `RF-${tag}-1`, madeTo: 'custom', installedOn: '2025-05-01', widthMm: 900, dropMm: 1200, ...fields })
  if (covering.status !== 201) throw new Error(`fixture covering failed: ${JSON.stringify(covering.body)}`)
  return covering.body.id as number
}
const recordOf = async (inspectionId: number) => (await db.query('SELECT record FROM inspections WHERE id = $1', [inspectionId])).rows[0].record

const labels = { warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false }

describe('sign-off takes the new record fields', () => {
  it('AU venetian (wand): inner loop pull-out and installed-as-instructed are stored and judged (SS 2014 s 6(1)(a): loops under 220 mm)', async () => {
    const id = await freshCovering('AU', { productType: 'venetian', control: 'wand' })
    const r = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { headHeightMm: 2100, innerCordStops: true, innerLoopPullOutMm: 40, installedPerInstructions: true, installedByBusiness: true, ...labels } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.verdict).toBe('compliant')
    expect(await recordOf(r.body.id)).toMatchObject({ innerLoopPullOutMm: 40, installedPerInstructions: true, installedByBusiness: true })
    // A 250 mm inner loop reaching 900 mm up is 220 mm or longer: it fails the same clause as an operating loop would.
    const long = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { headHeightMm: 2100, lowestCordPointMm: 900, innerCordStops: true, innerLoopPullOutMm: 250, installedPerInstructions: true, ...labels } })
    expect(long.body.verdict).toBe('non_compliant')
  })

  it('EU tension device: a device that does not hold the loop taut fails; one that does, screwed in, passes (EN 13120+A1)', async () => {
    const id = await freshCovering('EU', { productType: 'roller', control: 'chain_loop', installedOn: '2025-06-01' })
    const photo = (await uploadPhoto(installer, id, 'tension_device')).id
    const measured = { headHeightMm: 2200, lowestCordPointMm: 900, loopPullOutMm: 10, loopPerimeterMm: 1600, tensionDevice: true, tensionDeviceHeightMm: 900, tensionDeviceHoldN: 80,
      tensionDeviceTamperProof: true, deviceFixing: 'masonry_plugs', breakaway: false, cleat: false, ...labels }
    const slack = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { ...measured, tensionDeviceHoldsTaut: false }, photoIds: [photo] })
    expect(slack.status, JSON.stringify(slack.body)).toBe(201)
    expect(slack.body.verdict).toBe('non_compliant')
    const taut = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { ...measured, tensionDeviceHoldsTaut: true }, photoIds: [photo] })
    expect(taut.body.verdict).toBe('compliant')
    expect(await recordOf(taut.body.id)).toMatchObject({ tensionDeviceHoldsTaut: true, deviceFixing: 'masonry_plugs' })
  })

  it('CA: information not in English and French fails; recorded bilingual, the covering passes (SOR/2019-97, information)', async () => {
    const id = await freshCovering('CA', { productType: 'roller', control: 'cordless', manufacturedOn: '2024-05' })
    const base = { headHeightMm: 2050, ...labels }
    expect((await installer.post(`/api/coverings/${id}/inspections`, { measurements: { ...base, bilingualInformation: false } })).body.verdict).toBe('not_applicable')
    const corded = await freshCovering('CA', { productType: 'venetian', control: 'wand', manufacturedOn: '2024-05' })
    const inner = { ...base, innerCordsReachable: false, innerCordStops: true }
    expect((await installer.post(`/api/coverings/${corded}/inspections`, { measurements: { ...inner, bilingualInformation: false } })).body.verdict).toBe('non_compliant')
    expect((await installer.post(`/api/coverings/${corded}/inspections`, { measurements: { ...inner, bilingualInformation: true } })).body.verdict).toBe('compliant')
  })

  it('refuses a new field of the wrong kind, naming it', async () => {
    const id = await freshCovering('AU', { productType: 'roman', control: 'free_cord' })
    const flag = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { headHeightMm: 2100, installedPerInstructions: 'yes' } })
    expect(flag.status).toBe(400)
    expect(flag.body.message).toMatch(/^measurements\.installedPerInstructions/)
    const length = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { headHeightMm: 2100, innerLoopPullOutMm: -1 } })
    expect(length.status).toBe(400)
    expect(length.body.message).toMatch(/^measurements\.innerLoopPullOutMm/)
  })

  it('the register decides the room: a measured childrensRoom does not override it', async () => {
    const id = await freshCovering('AU', { productType: 'roller', control: 'cordless' }, { childrensRoom: true })
    const r = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { headHeightMm: 2100, childrensRoom: false } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect((await recordOf(r.body.id)).childrensRoom).toBe(true)
    expect((await officer.get(`/api/coverings/${id}`)).body.changedSinceInspection).toBe(false)
  })
})
