// Seeds the invented demo scenario (only with --demo), once: running it again leaves data alone.
// --other-workspace adds a second, unrelated business that tests use to prove tenants stay apart.
// Every business, person and address here is made up.
import { parseArgs } from 'node:util'
import type { Transaction } from 'sequelize'
import { createSequelize } from '../server/db'
import { Client, Covering, Opening, Site, Unit, User, Workspace } from '../server/models'
import { hashPasswordOffline } from '../server/lib/password'
import { recordInspection } from '../server/services/inspections'

const { values } = parseArgs({ options: { 'demo': { type: 'boolean' }, 'other-workspace': { type: 'boolean' } } })
const DEMO_PASSWORD = 'tautline-demo'

type Measures = Record<string, unknown>
// Measurement sets a fitter would record (millimetres, newtons).
const labelsOk = { warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false, installedPerInstructions: true, bilingualInformation: true }
// A tension device screwed into masonry plugs that holds the loop taut and cannot be undone by a child.
const deviceOk = { tensionDeviceTamperProof: true, deviceFixing: 'masonry_plugs', tensionDeviceHoldsTaut: true }
// Inner (lift) cords with stops fitted: pulled out between the slats or folds, little comes out.
const innerStopped = { innerCordStops: true, innerLoopPullOutMm: 40 }
const m = {
  chainTensioned: { headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, loopPerimeterMm: 70, tensionDevice: true, tensionDeviceHeightMm: 880, tensionDeviceHoldN: 85, ...deviceOk, cleat: false, breakaway: false, ...innerStopped, ...labelsOk },
  chainLoose: { headHeightMm: 2150, lowestCordPointMm: 1020, loopPullOutMm: 310, loopPerimeterMm: 620, tensionDevice: false, cleat: false, breakaway: false, innerCordStops: true, ...labelsOk },
  chainNoPullTest: { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900, tensionDeviceHoldN: null, ...deviceOk, cleat: false, breakaway: false, ...innerStopped, ...labelsOk },
  chainHigh: { headHeightMm: 2600, lowestCordPointMm: 1700, loopPullOutMm: 260, loopPerimeterMm: 520, tensionDevice: false, cleat: false, breakaway: false, innerCordStops: true, ...labelsOk },
  cordCleatHigh: { headHeightMm: 2200, lowestCordPointMm: 1650, freeCordLengthMm: 500, operatingCordLengthMm: 550, cleat: true, cleatHeightMm: 1650, tensionDevice: false, breakaway: false, ...innerStopped, ...labelsOk },
  cordCleatLow: { headHeightMm: 2200, lowestCordPointMm: 1150, freeCordLengthMm: 1000, operatingCordLengthMm: 1050, cleat: true, cleatHeightMm: 1150, tensionDevice: false, breakaway: false, innerCordStops: true, ...labelsOk },
  noLabel: { headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, loopPerimeterMm: 70, tensionDevice: true, tensionDeviceHeightMm: 880, tensionDeviceHoldN: 90, ...deviceOk, cleat: false, breakaway: false, ...innerStopped, ...labelsOk, installerLabel: false, swingTag: false },
  wand: { headHeightMm: 2100, ...innerStopped, ...labelsOk },
  // Cordless cellular and pleated: the lift cords run inside the cells or behind a closed rail, out of reach.
  cordless: { headHeightMm: 2100, innerCordStops: true, innerCordsReachable: false, ...labelsOk },
  motor: { headHeightMm: 2300, ...labelsOk },
  euBreakaway: { headHeightMm: 2300, lowestCordPointMm: 1000, loopPullOutMm: 150, loopPerimeterMm: 300, breakaway: true, tensionDevice: false, cleat: false, innerCordStops: true, ...labelsOk },
  euLow: { headHeightMm: 2300, lowestCordPointMm: 450, loopPullOutMm: 400, loopPerimeterMm: 800, breakaway: false, tensionDevice: false, cleat: false, innerCordStops: true, ...labelsOk },
  romanWide: { headHeightMm: 2250, lowestCordPointMm: 1600, freeCordLengthMm: 600, rearCordSpacingMm: 320, breakaway: false, cleat: true, cleatHeightMm: 1600, tensionDevice: false, innerCordStops: false, ...labelsOk },
  caShort: { headHeightMm: 2050, freeCordLengthMm: 180, loopPerimeterMm: 300, loopPullOutMm: 150, lowestCordPointMm: 1400, innerCordStops: true, ...labelsOk },
  caLong: { headHeightMm: 2050, freeCordLengthMm: 600, loopPerimeterMm: 900, loopPullOutMm: 450, lowestCordPointMm: 1100, innerCordStops: true, ...labelsOk },
} satisfies Record<string, Measures>

interface CoveringSeed { ref: string, productType: string, control: string, madeTo?: string, mount?: 'inside' | 'outside', widthMm: number, dropMm: number, measures?: Measures, installedOn: string, manufacturedOn?: string, daysAgo?: number }
interface OpeningSeed { ref: string, room: string, childrensRoom?: boolean, coverings: CoveringSeed[] }
interface UnitSeed { ref: string, name: string, floor?: string, openings: OpeningSeed[] }
interface SiteSeed { ref: string, name: string, address: string, jurisdiction: 'AU' | 'CA' | 'US' | 'EU', premises: string, client: 0 | 1, assignInstaller?: boolean, units: UnitSeed[] }

const c = (ref: string, productType: string, control: string, measures: Measures | undefined, extra: Partial<CoveringSeed> = {}): CoveringSeed =>
  ({ ref, productType, control, measures, widthMm: 1210, dropMm: 1480, mount: 'inside', madeTo: 'custom', installedOn: '2025-03-14', manufacturedOn: '2025-02', daysAgo: 30, ...extra })

const demoSites: SiteSeed[] = [
  { ref: 'WAT', name: 'Wattle Court', address: '27 Ironbark Street, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home', client: 0, assignInstaller: true, units: [
    { ref: 'U1', name: 'Unit 1', floor: 'Ground', openings: [
      { ref: 'W1', room: 'Living', coverings: [c('WAT-1-01', 'roller', 'chain_loop', m.chainTensioned, { widthMm: 1810, dropMm: 1650 })] },
      { ref: 'W2', room: 'Bedroom 2', childrensRoom: true, coverings: [c('WAT-1-02', 'roller', 'chain_loop', m.chainLoose, { daysAgo: 12 })] },
      { ref: 'W3', room: 'Kitchen', coverings: [c('WAT-1-03', 'venetian', 'wand', m.wand, { widthMm: 900, dropMm: 1000 })] },
    ] },
    { ref: 'U2', name: 'Unit 2', floor: 'Ground', openings: [
      { ref: 'W1', room: 'Living', coverings: [c('WAT-2-01', 'vertical', 'chain_loop', m.chainNoPullTest, { widthMm: 2400, dropMm: 2050 })] },
      { ref: 'W2', room: 'Bedroom 1', coverings: [c('WAT-2-02', 'roman', 'free_cord', m.cordCleatHigh)] },
      { ref: 'W3', room: 'Bedroom 2', childrensRoom: true, coverings: [c('WAT-2-03', 'cellular', 'cordless', m.cordless, { madeTo: 'stock' })] },
    ] },
    { ref: 'U3', name: 'Unit 3', floor: 'First', openings: [
      { ref: 'W1', room: 'Living', coverings: [c('WAT-3-01', 'roller', 'chain_loop', m.noLabel, { widthMm: 1600 })] },
      { ref: 'W2', room: 'Bedroom 1', coverings: [c('WAT-3-02', 'venetian', 'free_cord', m.cordCleatLow, { installedOn: '2024-11-02', manufacturedOn: '2024-09' })] },
    ] },
    { ref: 'U4', name: 'Unit 4', floor: 'First', openings: [
      { ref: 'W1', room: 'Living', coverings: [c('WAT-4-01', 'roller', 'motorised', m.motor, { widthMm: 2000 })] },
      { ref: 'W2', room: 'Bedroom 1', coverings: [c('WAT-4-02', 'roller', 'chain_loop', undefined, { installedOn: '2026-11-20' })] },
      { ref: 'W3', room: 'Bedroom 2', childrensRoom: true, coverings: [c('WAT-4-03', 'pleated', 'cord_loop', m.chainTensioned, { widthMm: 800, dropMm: 1200 })] },
    ] },
  ] },
  { ref: 'COB', name: 'Cobbler\'s Row', address: '5-11 Cobbler\'s Row, Dunmere DN4 7QX', jurisdiction: 'EU', premises: 'rental_home', client: 0, units: [
    { ref: 'F1', name: 'Flat 1', floor: 'Ground', openings: [
      { ref: 'W1', room: 'Lounge', coverings: [c('COB-1-01', 'roller', 'chain_loop', m.euBreakaway, { installedOn: '2025-06-03' })] },
      { ref: 'W2', room: 'Nursery', childrensRoom: true, coverings: [c('COB-1-02', 'roman', 'free_cord', m.romanWide, { installedOn: '2025-06-03' })] },
    ] },
    { ref: 'F2', name: 'Flat 2', floor: 'First', openings: [
      { ref: 'W1', room: 'Lounge', coverings: [c('COB-2-01', 'vertical', 'chain_loop', m.euLow, { installedOn: '2025-06-04' })] },
      { ref: 'W2', room: 'Bedroom', coverings: [c('COB-2-02', 'roller', 'chain_loop', m.chainTensioned, { installedOn: '2025-06-04' })] },
      { ref: 'D1', room: 'Lounge door', coverings: [c('COB-2-03', 'curtain', 'wand', m.wand, { installedOn: '2025-06-04', widthMm: 1500, dropMm: 2200 })] },
    ] },
    { ref: 'F3', name: 'Flat 3', floor: 'Second', openings: [
      { ref: 'W1', room: 'Lounge', coverings: [c('COB-3-01', 'pleated', 'cordless', m.cordless, { installedOn: '2025-06-05', madeTo: 'stock' })] },
      { ref: 'W2', room: 'Bedroom', coverings: [c('COB-3-02', 'roller', 'chain_loop', m.chainHigh, { installedOn: '2025-06-05' })] },
    ] },
  ] },
  { ref: 'SPR', name: 'Sprigwood Early Learning', address: '3 Lantern Way, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'childcare', client: 1, assignInstaller: true, units: [
    { ref: 'R1', name: 'Babies room', openings: [
      { ref: 'W1', room: 'Babies room', childrensRoom: true, coverings: [c('SPR-1-01', 'roller', 'chain_loop', m.chainTensioned, { widthMm: 2400 }), c('SPR-1-02', 'roller', 'chain_loop', m.chainLoose, { widthMm: 2400, daysAgo: 5 })] },
    ] },
    { ref: 'R2', name: 'Toddlers room', openings: [
      { ref: 'W1', room: 'Toddlers room', childrensRoom: true, coverings: [c('SPR-2-01', 'vertical', 'chain_loop', m.chainTensioned, { widthMm: 3000, dropMm: 2100 })] },
      { ref: 'W2', room: 'Sleep room', childrensRoom: true, coverings: [c('SPR-2-02', 'cellular', 'cordless', m.cordless, { madeTo: 'stock' })] },
    ] },
    { ref: 'R3', name: 'Office', openings: [
      { ref: 'W1', room: 'Office', coverings: [c('SPR-3-01', 'venetian', 'free_cord', m.cordCleatHigh, { widthMm: 900 })] },
      { ref: 'W2', room: 'Staff room', coverings: [c('SPR-3-02', 'vertical', 'chain_loop', m.chainNoPullTest, { widthMm: 1800, dropMm: 2000 })] },
    ] },
  ] },
  { ref: 'NTB', name: 'Northbank Terrace', address: '88 Tamarack Road, Port Ellery ON K0X 9Z9', jurisdiction: 'CA', premises: 'rental_home', client: 1, units: [
    { ref: 'A', name: 'Apartment A', openings: [
      { ref: 'W1', room: 'Living', coverings: [c('NTB-A-01', 'roller', 'chain_loop', m.caShort, { manufacturedOn: '2024-05', installedOn: '2024-08-19' })] },
      { ref: 'W2', room: 'Bedroom', coverings: [c('NTB-A-02', 'venetian', 'free_cord', m.caLong, { manufacturedOn: '2024-05', installedOn: '2024-08-19' })] },
    ] },
    { ref: 'B', name: 'Apartment B', openings: [
      { ref: 'W1', room: 'Living', coverings: [c('NTB-B-01', 'cellular', 'cordless', m.cordless, { manufacturedOn: '2024-05', installedOn: '2024-08-20', madeTo: 'stock' })] },
      { ref: 'W2', room: 'Bedroom', childrensRoom: true, coverings: [c('NTB-B-02', 'roller', 'chain_loop', m.caLong, { manufacturedOn: '2024-05', installedOn: '2024-08-20' })] },
      { ref: 'W3', room: 'Kitchen', coverings: [c('NTB-B-03', 'roller', 'motorised', m.motor, { manufacturedOn: '2024-05', installedOn: '2024-08-20' })] },
      { ref: 'W4', room: 'Den', coverings: [c('NTB-B-04', 'roman', 'free_cord', m.caShort, { manufacturedOn: '2024-05', installedOn: '2024-08-20' })] },
    ] },
  ] },
]

async function seedSites(db: ReturnType<typeof createSequelize>, transaction: Transaction, workspace: Workspace, clients: Client[], sites: SiteSeed[], inspectorId: number, installerId?: number) {
  const t = { transaction }
  let coverings = 0
  for (const s of sites) {
    const site = await Site.create({ workspaceId: workspace.id, clientId: clients[s.client]!.id, ref: s.ref, name: s.name, address: s.address, jurisdiction: s.jurisdiction, premises: s.premises, notes: null }, t)
    if (s.assignInstaller && installerId) {
      await db.query('INSERT INTO site_assignments (site_id, user_id) VALUES (:site, :user)', { replacements: { site: site.id, user: installerId }, transaction })
    }
    for (const u of s.units) {
      const unit = await Unit.create({ siteId: site.id, ref: u.ref, name: u.name, floor: u.floor ?? null, notes: null }, t)
      for (const o of u.openings) {
        const opening = await Opening.create({ siteId: site.id, unitId: unit.id, ref: o.ref, room: o.room, childrensRoom: o.childrensRoom ?? false, recessWidthMm: null, recessHeightMm: null, notes: null }, t)
        for (const cv of o.coverings) {
          const covering = await Covering.create({
            siteId: site.id, openingId: opening.id, ref: cv.ref, productType: cv.productType, control: cv.control, madeTo: cv.madeTo ?? null,
            mount: cv.mount ?? null, fixing: 'top', controlSide: 'right', widthMm: cv.widthMm, dropMm: cv.dropMm, makerModel: null,
            manufacturedOn: cv.manufacturedOn ?? null, installedOn: cv.installedOn,
          }, t)
          coverings++
          if (cv.measures) {
            const inspectedAt = new Date(Date.now() - (cv.daysAgo ?? 30) * 86_400_000)
            await recordInspection(db, { workspaceId: workspace.id, site, covering, kind: 'fitting', inspectorId, inspectedAt,
              measurements: { ...cv.measures, childrensRoom: o.childrensRoom ?? false } }, transaction)
          }
        }
      }
    }
  }
  return coverings
}

async function seedDemo(db: ReturnType<typeof createSequelize>) {
  if (await User.findOne({ where: { email: 'admin@demo.tautline.test' } })) {
    console.log('[tautline] demo data already present; leaving it as it is')
    return
  }
  const hash = await hashPasswordOffline(DEMO_PASSWORD)
  // One transaction: a failure part-way leaves nothing behind, so the next run seeds afresh.
  await db.transaction(async (transaction) => {
    const t = { transaction }
    const workspace = await Workspace.create({ name: 'Tallowmere Blinds & Awnings', contactPhone: '+61 2 5550 0142', contactEmail: 'fitters@tallowmere.example', address: '14 Quarry Lane, Kellerton NSW 2999', licenceNumber: 'DEMO-41877' }, t)
    const clients = [
      await Client.create({ workspaceId: workspace.id, name: 'Brindlewood Lettings', contactName: 'Priya Marsh', reportEmail: 'reports@brindlewood.example', phone: '+61 2 5550 0177' }, t),
      await Client.create({ workspaceId: workspace.id, name: 'Oxbury Community Housing', contactName: 'Tom Hallett', reportEmail: 'safety@oxbury.example', phone: '+61 2 5550 0190' }, t),
    ]
    const mk = (email: string, name: string, role: User['role'], clientId: number | null = null) =>
      User.create({ workspaceId: workspace.id, clientId, email, name, role, passwordHash: hash, lastSignInAt: null }, t)
    await mk('admin@demo.tautline.test', 'Imogen Vale', 'admin')
    const officer = await mk('officer@demo.tautline.test', 'Dev Okonjo', 'officer')
    const installer = await mk('installer@demo.tautline.test', 'Sam Ferrow', 'installer')
    await mk('manager@demo.tautline.test', 'Priya Marsh', 'manager', clients[0]!.id)
    await mk('manager2@demo.tautline.test', 'Tom Hallett', 'manager', clients[1]!.id)
    const n = await seedSites(db, transaction, workspace, clients, demoSites, installer.id, installer.id)
    console.log(`[tautline] demo seeded: 1 workspace, 2 clients, ${demoSites.length} sites, ${n} coverings, 5 accounts (password ${DEMO_PASSWORD}); officer #${officer.id}`)
  })
}

async function seedOther(db: ReturnType<typeof createSequelize>) {
  if (await User.findOne({ where: { email: 'admin@other.tautline.test' } })) return
  const hash = await hashPasswordOffline(DEMO_PASSWORD)
  await db.transaction(async (transaction) => {
    const t = { transaction }
    const workspace = await Workspace.create({ name: 'Orchard Lane Shutters', contactPhone: '+44 20 5550 0100', contactEmail: 'office@orchardlane.example', address: '2 Orchard Lane, Dunmere', licenceNumber: null }, t)
    const client = await Client.create({ workspaceId: workspace.id, name: 'Greyfield Estates', contactName: null, reportEmail: 'estates@greyfield.example', phone: null }, t)
    const mk = (email: string, name: string, role: User['role'], clientId: number | null = null) =>
      User.create({ workspaceId: workspace.id, clientId, email, name, role, passwordHash: hash, lastSignInAt: null }, t)
    const admin = await mk('admin@other.tautline.test', 'Other Admin', 'admin')
    await mk('officer@other.tautline.test', 'Other Officer', 'officer')
    await mk('installer@other.tautline.test', 'Other Installer', 'installer')
    await mk('manager@other.tautline.test', 'Other Manager', 'manager', client.id)
    await seedSites(db, transaction, workspace, [client, client], [{ ref: 'GRY', name: 'Greyfield House', address: '1 Greyfield Road, Dunmere', jurisdiction: 'EU', premises: 'rental_home', client: 0, units: [
      { ref: 'G1', name: 'Flat G1', openings: [{ ref: 'W1', room: 'Lounge', coverings: [c('GRY-1-01', 'roller', 'chain_loop', m.chainTensioned)] }] },
    ] }], admin.id)
    console.log('[tautline] test fixture: a second workspace seeded')
  })
}

const db = createSequelize(undefined, { poolMax: 2 })
try {
  if (values.demo) await seedDemo(db)
  else console.log('[tautline] not in demo mode: no demo data seeded (use `npm run user:create` for the first admin)')
  if (values['other-workspace']) await seedOther(db)
}
finally {
  await db.close()
}
