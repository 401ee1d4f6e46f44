// Speed of the landlord report: `npx tsx scripts/bench/report.ts [--out file.pdf] [--site id]`, with the variables
// printed by `node scripts/run.mjs services dev` exported (DATABASE_URL, S3_*), migrated. Builds a site of 500 coverings
// and 100 photos in a new throwaway workspace ("Bench <time>", never deleted: its rows are evidence like any other),
// or reuses a site an earlier run built (--site), then times the report in fresh processes and prints the figures
// against the goals. Prints; never fails on time.
import { spawnSync } from 'node:child_process'
import { writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import { PDFDocument } from 'pdf-lib'
import sharp from 'sharp'
import { createSequelize, migrator } from '../../server/db'
import { Client, Covering, Opening, Site, Unit, User, Workspace } from '../../server/models'
import { recordInspection } from '../../server/services/inspections'
import { storePhoto } from '../../server/services/photos'
import { buildSiteReport, loadReportThumbnails, loadSiteReport, renderSiteReport } from '../../server/services/report'

const GOALS = { fullSeconds: 5, peakRssMb: 500, sizeMb: 15, ratio: 1.5 }
const UNITS = 50
const COVERINGS_PER_UNIT = 10
const PHOTOS = 100
const WARM_RUNS = 5

// --site <id> times an existing site (one an earlier run built) instead of building a new one.
const { values } = parseArgs({ options: { measure: { type: 'string' }, out: { type: 'string' }, site: { type: 'string' } } })

// The local S3 fake's fixed keys, when only its endpoint was exported.
if (process.env.S3_ENDPOINT && !process.env.S3_ACCESS_KEY_ID && /\/\/(127\.0\.0\.1|localhost)[:/]/.test(process.env.S3_ENDPOINT)) {
  Object.assign(process.env, { S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: '1' })
}

// Seeded generator so every run builds the same mix.
let seed = 0x5eed
function random(): number {
  seed = (seed + 0x6d2b79f5) | 0
  let t = Math.imul(seed ^ (seed >>> 15), 1 | seed)
  t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296
}

const labelsOk = { warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false }
// Measurement sets a fitter would record (mm, N), with the share of coverings that get each.
const mixes: Array<{ share: number, control: string, product: string, measures: Record<string, unknown> | null }> = [
  { share: 0.35, control: 'chain_loop', product: 'roller', measures: { headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, loopPerimeterMm: 70, tensionDevice: true, tensionDeviceHeightMm: 880, tensionDeviceHoldN: 85, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true, ...labelsOk } },
  { share: 0.14, control: 'chain_loop', product: 'vertical', measures: { headHeightMm: 2150, lowestCordPointMm: 1020, loopPullOutMm: 310, loopPerimeterMm: 620, tensionDevice: false, cleat: false, breakaway: false, innerCordStops: true, ...labelsOk } },
  { share: 0.1, control: 'free_cord', product: 'venetian', measures: { headHeightMm: 2200, lowestCordPointMm: 1150, freeCordLengthMm: 1000, operatingCordLengthMm: 1050, cleat: true, cleatHeightMm: 1150, tensionDevice: false, breakaway: false, innerCordStops: true, ...labelsOk } },
  { share: 0.1, control: 'chain_loop', product: 'roller', measures: { headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, loopPerimeterMm: 70, tensionDevice: true, tensionDeviceHeightMm: 880, tensionDeviceHoldN: 90, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true, ...labelsOk, installerLabel: false, swingTag: false } },
  { share: 0.1, control: 'chain_loop', product: 'roller', measures: { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900, tensionDeviceHoldN: null, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true, ...labelsOk } },
  { share: 0.16, control: 'wand', product: 'venetian', measures: { headHeightMm: 2100, innerCordStops: true, ...labelsOk } },
  { share: 0.05, control: 'chain_loop', product: 'roller', measures: null },
]
function pickMix() {
  let r = random()
  for (const m of mixes) if ((r -= m.share) < 0) return m
  return mixes[0]!
}
const rooms = ['Living', 'Bedroom 1', 'Bedroom 2', 'Kitchen', 'Dining', 'Study', 'Hall', 'Bedroom 3', 'Laundry', 'Sunroom']

/** A photo-sized JPEG with smooth shading and grain, so its thumbnail weighs what a real one does. */
async function photoJpeg(i: number): Promise<Buffer> {
  const width = 1200
  const height = 900
  const raw = Buffer.alloc(width * height * 3)
  const [r0, g0, b0] = [90 + (i * 37) % 120, 80 + (i * 53) % 110, 60 + (i * 71) % 100]
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const o = (y * width + x) * 3
      const shade = (x / width) * 60 + (y / height) * 40 + Math.sin((x + i * 13) / 37) * 12
      const grain = (random() - 0.5) * 18
      raw[o] = Math.max(0, Math.min(255, r0 + shade + grain))
      raw[o + 1] = Math.max(0, Math.min(255, g0 + shade * 0.8 + grain))
      raw[o + 2] = Math.max(0, Math.min(255, b0 + shade * 0.6 + grain))
    }
  }
  return sharp(raw, { raw: { width, height, channels: 3 } }).jpeg({ quality: 85 }).toBuffer()
}

async function pool<T>(items: T[], concurrency: number, work: (item: T, index: number) => Promise<void>) {
  let next = 0
  await Promise.all(Array.from({ length: concurrency }, async () => {
    while (next < items.length) {
      const i = next++
      await work(items[i]!, i)
    }
  }))
}

async function buildSite(): Promise<{ siteId: number, workspaceName: string }> {
  const db = createSequelize(undefined, { poolMax: 10 })
  try {
    const pending = await migrator(db).pending()
    if (pending.length) throw new Error(`the database lacks ${pending.map(m => m.name).join(', ')}: run \`npx tsx scripts/migrate.ts\` with the same variables first`)
    const stamp = new Date().toISOString().replace(/\.\d+Z$/, 'Z')
    const workspaceName = `Bench ${stamp}`
    const workspace = await Workspace.create({ name: workspaceName, contactPhone: '+61 2 5550 0000', contactEmail: 'bench@bench.tautline.test', address: '1 Bench Road', licenceNumber: 'BENCH-1' })
    const client = await Client.create({ workspaceId: workspace.id, name: 'Bench Lettings', contactName: 'Bench Contact', reportEmail: 'reports@bench.tautline.test', phone: null })
    const user = await User.create({ workspaceId: workspace.id, clientId: null, email: `bench-${Date.now()}@bench.tautline.test`, name: 'Bench Officer', role: 'officer', passwordHash: null, lastSignInAt: null })
    const site = await Site.create({ workspaceId: workspace.id, clientId: client.id, ref: 'BENCH', name: 'Bench Gardens', address: '500 Covering Street, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home', notes: null })
    const actor = { id: user.id, role: user.role, workspaceId: workspace.id, clientId: null }

    const planned: Array<{ covering: Covering, measures: Record<string, unknown> | null, childrensRoom: boolean }> = []
    for (let u = 1; u <= UNITS; u++) {
      const unit = await Unit.create({ siteId: site.id, ref: `U${u}`, name: `Unit ${u}`, floor: u <= UNITS / 2 ? 'Ground' : 'First', notes: null })
      for (let n = 1; n <= COVERINGS_PER_UNIT; n++) {
        const mix = pickMix()
        const childrensRoom = rooms[n - 1]!.startsWith('Bedroom 2')
        const opening = await Opening.create({ siteId: site.id, unitId: unit.id, ref: `W${n}`, room: rooms[n - 1]!, childrensRoom, recessWidthMm: null, recessHeightMm: null, notes: null })
        const covering = await Covering.create({ siteId: site.id, openingId: opening.id, ref: `BG-${u}-${String(n).padStart(2, '0')}`, productType: mix.product, control: mix.control,
          madeTo: 'custom', mount: 'inside', fixing: 'top', controlSide: 'right', widthMm: 600 + Math.round(random() * 2400), dropMm: 900 + Math.round(random() * 1400),
          makerModel: null, manufacturedOn: '2025-02', installedOn: '2025-03-14' })
        planned.push({ covering, measures: mix.measures, childrensRoom })
      }
    }

    // Photos of the failing coverings (two each), stored as the app stores them: original, thumbnail, hash.
    const failing = planned.filter(p => p.measures && (p.measures.loopPullOutMm === 310 || p.measures.cleatHeightMm === 1150 || p.measures.installerLabel === false))
    const photoTargets = Array.from({ length: PHOTOS }, (_, i) => failing[Math.floor(i / 2) % failing.length]!)
    const photoIds = new Map<number, number[]>()
    await pool(photoTargets, 4, async (target, i) => {
      const photo = await storePhoto(db, { actor, covering: target.covering, kind: i % 2 ? 'defect' : 'whole', data: await photoJpeg(i), fileName: `bench-${i}.jpg` })
      photoIds.set(target.covering.id, [...(photoIds.get(target.covering.id) ?? []), photo.id])
    })

    await pool(planned.filter(p => p.measures), 8, async (p) => {
      const inspectedAt = new Date(Date.now() - (1 + Math.floor(random() * 120)) * 86_400_000)
      await recordInspection(db, { workspaceId: workspace.id, site, covering: p.covering, kind: 'fitting', inspectorId: user.id, inspectedAt,
        measurements: { ...p.measures, childrensRoom: p.childrensRoom }, photoIds: photoIds.get(p.covering.id) ?? [] })
    })
    await db.query(`INSERT INTO audits (workspace_id, site_id, status, opened_by, opened_at, closed_by, closed_by_name, closed_at)
      VALUES (:ws, :site, 'closed', :user, now() - interval '2 days', :user, 'Bench Officer', now() - interval '1 day')`,
    { replacements: { ws: workspace.id, site: site.id, user: user.id } })
    return { siteId: site.id, workspaceName }
  }
  finally {
    await db.close()
  }
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!

/**
 * One report, cold, in a process of its own: its time, and the process's peak memory while making it
 * (not the site builder's, nor that of the repeated runs below).
 */
async function measureOnce(siteId: number, out: string) {
  const db = createSequelize(undefined, { poolMax: 10 })
  try {
    const t0 = performance.now()
    const { data, pdf } = await buildSiteReport(db, siteId)
    const ms = performance.now() - t0
    const peakRssMb = process.resourceUsage().maxRSS / 1024
    writeFileSync(out, pdf)
    // Counted after the peak was read, so parsing the file again does not weigh on the figure.
    const pages = (await PDFDocument.load(pdf)).getPageCount()
    return { coverings: data.summary.total, failing: data.summary.non_compliant, photos: data.failures.reduce((n, f) => n + f.photos.length, 0), pages, ms, peakRssMb, sizeBytes: pdf.byteLength }
  }
  finally {
    await db.close()
  }
}

/** Warm runs: the whole report as the route makes it, against drawing the same pages from data already in memory. */
async function measureWarm(siteId: number) {
  const db = createSequelize(undefined, { poolMax: 10 })
  try {
    const data = await loadSiteReport(db, siteId)
    const thumbnails = await loadReportThumbnails(data)
    await buildSiteReport(db, siteId)
    const fullMs: number[] = []
    const drawMs: number[] = []
    const loadMs: number[] = []
    // Interleaved, so warm-up and garbage collection weigh alike on both figures.
    for (let i = 0; i < WARM_RUNS; i++) {
      const t0 = performance.now()
      await buildSiteReport(db, siteId)
      fullMs.push(performance.now() - t0)
      const t1 = performance.now()
      await renderSiteReport(data, thumbnails)
      drawMs.push(performance.now() - t1)
      const t2 = performance.now()
      await loadReportThumbnails(await loadSiteReport(db, siteId))
      loadMs.push(performance.now() - t2)
    }
    return { fullMs: median(fullMs), drawMs: median(drawMs), loadMs: median(loadMs), peakRssMb: process.resourceUsage().maxRSS / 1024 }
  }
  finally {
    await db.close()
  }
}

function child<T>(args: string[]): T {
  const r = spawnSync(process.execPath, [...process.execArgv, process.argv[1]!, ...args], { encoding: 'utf8', env: process.env })
  if (r.status !== 0) {
    console.error(r.stderr || r.stdout)
    process.exit(1)
  }
  return JSON.parse(r.stdout.trim().split('\n').pop()!) as T
}

const out = values.out ?? join(tmpdir(), 'tautline-bench-report.pdf')
if (values.measure === 'once') {
  process.stdout.write(`${JSON.stringify(await measureOnce(Number(values.site), out))}\n`)
}
else if (values.measure === 'warm') {
  process.stdout.write(`${JSON.stringify(await measureWarm(Number(values.site)))}\n`)
}
else {
  let siteId = Number(values.site)
  if (!values.site) {
    console.log(`building a site of ${UNITS * COVERINGS_PER_UNIT} coverings and ${PHOTOS} photos…`)
    const built = Date.now()
    const made = await buildSite()
    siteId = made.siteId
    console.log(`  built in ${((Date.now() - built) / 1000).toFixed(1)} s in workspace "${made.workspaceName}" (site #${siteId}; kept, time it again with --site ${siteId})`)
  }
  const once = child<Awaited<ReturnType<typeof measureOnce>>>(['--measure', 'once', '--site', String(siteId), '--out', out])
  const warm = child<Awaited<ReturnType<typeof measureWarm>>>(['--measure', 'warm', '--site', String(siteId)])
  const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`
  const mark = (ok: boolean) => (ok ? 'met' : 'NOT met')
  const sizeMb = once.sizeBytes / 1024 / 1024
  const ratio = warm.fullMs / warm.drawMs
  console.log(`\nreport of ${once.coverings} coverings (${once.failing} non-compliant), ${once.photos} photo thumbnails, ${once.pages} pages → ${out}`)
  console.log(`  full PDF (load + thumbnails + draw), first run in a fresh process: ${s(once.ms)}   goal ≤ ${GOALS.fullSeconds} s: ${mark(once.ms <= GOALS.fullSeconds * 1000)}`)
  console.log(`  peak memory (RSS) of that process:                               ${once.peakRssMb.toFixed(0)} MB   goal ≤ ${GOALS.peakRssMb} MB: ${mark(once.peakRssMb <= GOALS.peakRssMb)}`)
  console.log(`  PDF size:                                                        ${sizeMb.toFixed(2)} MB   goal ≤ ${GOALS.sizeMb} MB: ${mark(sizeMb <= GOALS.sizeMb)}`)
  console.log(`  full PDF, warm, median of ${WARM_RUNS}:                                     ${s(warm.fullMs)}`)
  console.log(`  drawing only, data and thumbnails in memory, median of ${WARM_RUNS}:        ${s(warm.drawMs)}`)
  console.log(`  ratio full ÷ drawing:                                            ${ratio.toFixed(2)}   goal ≤ ${GOALS.ratio}: ${mark(ratio <= GOALS.ratio)}`)
  console.log(`  (loading and thumbnails alone: ${s(warm.loadMs)}; peak RSS over ${3 * WARM_RUNS + 2} reports and loads: ${warm.peakRssMb.toFixed(0)} MB)`)
}
