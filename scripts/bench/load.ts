// Load on the built server: `npx tsx scripts/bench/load.ts [--duration 60] [--connections 50] [--compare 20]`, with the
// variables printed by `node scripts/run.mjs services dev` exported (DATABASE_URL, S3_*, SMTP_URL). Builds a scratch
// database next to DATABASE_URL's (tautline_bench_load, made afresh and dropped at the end): 6 sites, 3,000 coverings
// with their inspections, 40 photos uploaded through the API. Starts the built server (.output, rebuilt as
// `scripts/run.mjs` does when the sources changed) on 127.0.0.1:3300 against it, signs every connection in with a
// session of its own, then runs autocannon for --duration seconds at --connections connections of mixed traffic, one
// autocannon per kind: lists, covering pages, checks, inspections signed off by installers, photo thumbnails. Prints
// each kind's req/s, p50/p99 and errors, then counts the inspection rows against the answers that acknowledged them.
// Last, for --compare seconds each, the coverings list through the app against a bare node:http handler (port 3301)
// sending the very statements the route sends through pg. Prints; never fails on time.
import { spawn, spawnSync } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { cpSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { readFile, writeFile } from 'node:fs/promises'
import { createServer } from 'node:http'
import type { AddressInfo } from 'node:net'
import { cpus, loadavg, tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { parseArgs } from 'node:util'
import autocannon from 'autocannon'
import pg from 'pg'
import sharp from 'sharp'
import { Sequelize } from 'sequelize'
import { createSequelize } from '../../server/db'
import { Client, Covering, Opening, Site, Unit, User, Workspace } from '../../server/models'
import { hashPasswordOffline } from '../../server/lib/password'
import { sessionUser } from '../../server/services/accounts'
import { recordInspection } from '../../server/services/inspections'
import { listCoverings } from '../../server/services/register'
import { deleteObject } from '../../server/services/storage'
import { sourceHash } from '../source-hash.mjs'
import { bundled, pickMix, scratchDatabase, seeded } from './jobs-common'

const GOALS = { readP99Ms: 100, errors: 0, lostWrites: 0 }
const SITES = 6
const UNITS_PER_SITE = 50
const OPENINGS_PER_UNIT = 5
const COVERINGS_PER_OPENING = 2
const PHOTOS = 40
const LIST_PAGE_SIZE = 50
const PASSWORD = 'load-bench-password'
const DATABASE = 'tautline_bench_load'
const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..')
const benchDir = join(root, '.data', 'bench')
const script = fileURLToPath(import.meta.url)

const { values } = parseArgs({ options: {
  duration: { type: 'string', default: '60' }, connections: { type: 'string', default: '50' }, compare: { type: 'string', default: '20' },
  part: { type: 'string' }, url: { type: 'string' }, port: { type: 'string' }, plan: { type: 'string' },
} })

// The local S3 fake's fixed keys, when only its endpoint was exported.
if (process.env.S3_ENDPOINT && !process.env.S3_ACCESS_KEY_ID && /\/\/(127\.0\.0\.1|localhost)[:/]/.test(process.env.S3_ENDPOINT)) {
  Object.assign(process.env, { S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: '1' })
}

type Mix = ReturnType<typeof pickMix>
interface Seeded {
  workspaceId: number
  officerEmail: string
  installerEmail: string
  siteIds: number[]
  coveringIds: number[]
  // Coverings an installer can sign off without a photo of a tension device, with the measurements they were fitted with.
  writable: Array<{ id: number, mix: Mix }>
}
interface BarePlan { sessions: string[], pages: Array<{ items: string, count: string, page: number, pageSize: number }> }

// ——— the bare baseline: node:http and pg, nothing else ———

async function bareServer() {
  const plan = JSON.parse(await readFile(values.plan!, 'utf8')) as BarePlan
  // The same pool size the server's Sequelize gets by default (DB_POOL_MAX 10).
  const pool = new pg.Pool({ connectionString: values.url!, max: 10 })
  const server = createServer(async (req, res) => {
    try {
      const session = plan.sessions[Number(req.headers['x-session'] ?? 0) % plan.sessions.length]!
      const page = plan.pages[Number(new URL(req.url ?? '/', 'http://bare').searchParams.get('v') ?? 0) % plan.pages.length]!
      const user = await pool.query(session)
      if (!user.rowCount) {
        res.writeHead(401).end()
        return
      }
      const [items, count] = await Promise.all([pool.query(page.items), pool.query(page.count)])
      const body = JSON.stringify({ items: items.rows, total: count.rows[0].total, page: page.page, pageSize: page.pageSize })
      res.writeHead(200, { 'content-type': 'application/json' }).end(body)
    }
    catch (err) {
      res.writeHead(500).end(String(err))
    }
  })
  server.listen(Number(values.port), '127.0.0.1', () => console.log('ready'))
  process.on('SIGTERM', () => server.close(() => pool.end().then(() => process.exit(0))))
}

// ——— the build: the same source hash as scripts/run.mjs, so either one's build serves both ———

function pidAlive(file: string) {
  try { process.kill(Number(readFileSync(file, 'utf8')), 0); return true }
  catch { return false }
}

const testLock = join(tmpdir(), 'tautline-test-3100.lock')

/**
 * Builds .output when the sources changed, then copies it aside and serves the copy: a test run elsewhere in this
 * checkout may rebuild .output while the benchmark runs. Holds the machine's test lock meanwhile, so no test run
 * builds or serves .output halfway through.
 */
async function serverBundle() {
  let told = false
  for (;;) {
    try { writeFileSync(testLock, String(process.pid), { flag: 'wx' }); break }
    catch {
      if (!pidAlive(testLock)) { rmSync(testLock, { force: true }); continue }
      if (!told) { console.log('a test run holds the machine\'s test lock (it uses .output); waiting for it to end'); told = true }
      await new Promise(r => setTimeout(r, 2000))
    }
  }
  try {
    const stamp = join(root, '.output', '.tautline-source-hash')
    const want = sourceHash(root)
    if (!existsSync(stamp) || readFileSync(stamp, 'utf8') !== want || !existsSync(join(root, '.output', 'server', 'index.mjs'))) {
      console.log('building the app (nuxt build): the sources changed since the last build')
      const r = spawnSync(join(root, 'node_modules', '.bin', 'nuxt'), ['build'], { cwd: root, stdio: ['ignore', 'ignore', 'inherit'], env: { ...process.env, NODE_ENV: 'production' } })
      if (r.status !== 0) throw new Error('nuxt build failed')
      writeFileSync(stamp, want)
    }
    const copy = join(benchDir, 'load-output')
    rmSync(copy, { recursive: true, force: true })
    cpSync(join(root, '.output'), copy, { recursive: true })
    return copy
  }
  finally {
    if (existsSync(testLock) && readFileSync(testLock, 'utf8') === String(process.pid)) rmSync(testLock, { force: true })
  }
}

// ——— the scratch register ———

const rooms = ['Living', 'Bedroom 1', 'Bedroom 2', 'Kitchen', 'Study']

async function inParallel<T>(items: T[], concurrency: number, work: (item: T, index: number) => Promise<void>) {
  let next = 0
  await Promise.all(Array.from({ length: concurrency }, async () => {
    while (next < items.length) {
      const i = next++
      await work(items[i]!, i)
    }
  }))
}

async function seedRegister(url: string): Promise<Seeded> {
  const db = createSequelize(url, { poolMax: 8 })
  const random = seeded(0x10ad)
  const passwordHash = await hashPasswordOffline(PASSWORD)
  const workspace = await Workspace.create({ name: 'Loadstone Blinds', contactPhone: null, contactEmail: 'office@loadstone.tautline.test', address: null, licenceNumber: null })
  const client = await Client.create({ workspaceId: workspace.id, name: 'Loadstone Lettings', contactName: null, reportEmail: 'reports@loadstone.tautline.test', phone: null })
  const person = (email: string, name: string, role: 'officer' | 'installer') =>
    User.create({ workspaceId: workspace.id, clientId: null, email, name, role, passwordHash, lastSignInAt: null })
  const officer = await person('officer@loadstone.tautline.test', 'Load Officer', 'officer')
  const installer = await person('installer@loadstone.tautline.test', 'Load Installer', 'installer')
  const planned: Array<{ site: Site, covering: Covering, mix: Mix, childrensRoom: boolean }> = []
  const range = (n: number) => Array.from({ length: n }, (_, i) => i + 1)
  for (const s of range(SITES)) {
    const site = await Site.create({ workspaceId: workspace.id, clientId: client.id, ref: `LD${s}`, name: `Loadstone Court ${s}`, address: `${s} Trial Parade, Kellerton NSW 2999`, jurisdiction: 'AU', premises: 'rental_home', notes: null })
    const units = await Unit.bulkCreate(range(UNITS_PER_SITE).map(u => ({ siteId: site.id, ref: `U${u}`, name: `Unit ${u}`, floor: null, notes: null })), { returning: true })
    const openings = await Opening.bulkCreate(units.flatMap(unit => range(OPENINGS_PER_UNIT).map(o => ({
      siteId: site.id, unitId: unit.id, ref: `W${o}`, room: rooms[o - 1]!, childrensRoom: o === 3, recessWidthMm: null, recessHeightMm: null, notes: null,
    }))), { returning: true })
    const rows = openings.flatMap(opening => range(COVERINGS_PER_OPENING).map(n => ({ opening, mix: pickMix(random), ref: `LD${s}-${opening.unitId}-${opening.ref}-${n}` })))
    const coverings = await Covering.bulkCreate(rows.map(r => ({
      siteId: site.id, openingId: r.opening.id, ref: r.ref, productType: r.mix.product, control: r.mix.control, madeTo: 'custom', mount: 'inside' as const, fixing: 'top' as const,
      controlSide: 'right' as const, widthMm: 600 + Math.round(random() * 2400), dropMm: 900 + Math.round(random() * 1400), makerModel: null, manufacturedOn: '2025-02', installedOn: '2025-03-14',
    })), { returning: true })
    coverings.forEach((covering, i) => planned.push({ site, covering, mix: rows[i]!.mix, childrensRoom: rows[i]!.opening.childrensRoom }))
  }
  // Each covering fitted once, some weeks ago, as the app records it: inspection, findings, remedies, activity.
  await inParallel(planned, 8, async (p) => {
    await recordInspection(db, { workspaceId: workspace.id, site: p.site, covering: p.covering, kind: 'fitting', inspectorId: installer.id,
      inspectedAt: new Date(Date.now() - (7 + Math.floor(random() * 120)) * 86_400_000), measurements: { ...p.mix.measures, childrensRoom: p.childrensRoom } })
  })
  await db.close()
  return {
    workspaceId: workspace.id, officerEmail: officer.email, installerEmail: installer.email,
    siteIds: [...new Set(planned.map(p => p.site.id))], coveringIds: planned.map(p => p.covering.id),
    writable: planned.filter(p => p.mix.measures.tensionDevice !== true).map(p => ({ id: p.covering.id, mix: p.mix })),
  }
}

/** A photo-sized JPEG (1200 × 900 px) with shading and grain, so its thumbnail weighs what a real one does. */
function photoJpeg(i: number, random: () => number) {
  const [width, height] = [1200, 900]
  const raw = Buffer.alloc(width * height * 3)
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const o = (y * width + x) * 3
      const shade = (x / width) * 70 + (y / height) * 40 + Math.sin((x + i * 17) / 41) * 14 + (random() - 0.5) * 18
      raw[o] = Math.min(255, 90 + shade + (i * 37) % 60)
      raw[o + 1] = Math.min(255, 80 + shade * 0.8 + (i * 53) % 50)
      raw[o + 2] = Math.min(255, 60 + shade * 0.6)
    }
  }
  return sharp(raw, { raw: { width, height, channels: 3 } }).jpeg({ quality: 85 }).toBuffer()
}

// ——— the server under test ———

async function freePort(preferred: number) {
  const listen = (port: number) => new Promise<number>((resolve, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(port, '127.0.0.1', () => {
      const { port: got } = probe.address() as AddressInfo
      probe.close(() => resolve(got))
    })
  })
  return listen(preferred).catch(() => listen(0))
}

async function waitFor(url: string, what: string, ms = 60_000) {
  const until = Date.now() + ms
  while (Date.now() < until) {
    try { if ((await fetch(url)).ok) return }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error(`${what} did not answer on ${url}`)
}

function startServer(bundle: string, url: string, port: number, requestLog: string) {
  const out = openSync(join(benchDir, 'load-server.log'), 'w')
  rmSync(requestLog, { force: true })
  const env: NodeJS.ProcessEnv = {
    ...process.env, DATABASE_URL: url, NUXT_SESSION_PASSWORD: randomBytes(32).toString('hex'), APP_URL: `http://127.0.0.1:${port}`,
    HOST: '127.0.0.1', NITRO_HOST: '127.0.0.1', PORT: String(port), NITRO_PORT: String(port), NODE_ENV: 'production', LOG_FILE: requestLog,
  }
  delete env.TAUTLINE_TEST
  return spawn(process.execPath, [join(bundle, 'server', 'index.mjs')], { cwd: root, env, stdio: ['ignore', out, out] })
}

function stopChild(child: ChildProcess | undefined) {
  if (!child || child.exitCode !== null || child.signalCode !== null) return Promise.resolve()
  return new Promise<void>((resolve) => {
    child.once('exit', () => resolve())
    child.kill('SIGTERM')
  })
}

async function signIn(base: string, email: string) {
  const r = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD }) })
  const cookie = r.headers.getSetCookie().find(c => c.startsWith('nuxt-session='))
  if (r.status !== 200 || !cookie) throw new Error(`sign-in as ${email} answered ${r.status}: ${await r.text()}`)
  return cookie.split(';')[0]!
}

// ——— the traffic ———

type KindName = 'lists' | 'covering' | 'checks' | 'inspections' | 'thumbnails'
interface Kind { name: KindName, label: string, share: number, read: boolean, role: 'officer' | 'installer', method: 'GET' | 'POST' }
const kinds: Kind[] = [
  { name: 'lists', label: 'lists (sites, coverings)', share: 0.28, read: true, role: 'officer', method: 'GET' },
  { name: 'covering', label: 'covering page', share: 0.24, read: true, role: 'officer', method: 'GET' },
  { name: 'checks', label: 'checks', share: 0.12, read: false, role: 'installer', method: 'POST' },
  { name: 'inspections', label: 'inspections (sign-off)', share: 0.2, read: false, role: 'installer', method: 'POST' },
  { name: 'thumbnails', label: 'photo thumbnails', share: 0.16, read: true, role: 'officer', method: 'GET' },
]

/** Connections per kind: its share of the total, at least one each, rounded so they add up. */
function split(total: number) {
  const exact = kinds.map(k => k.share * total)
  const counts = exact.map(x => Math.max(1, Math.floor(x)))
  const order = exact.map((x, i) => ({ i, rest: x - Math.floor(x) })).sort((a, b) => b.rest - a.rest)
  for (let j = 0; counts.reduce((a, b) => a + b, 0) < total; j++) counts[order[j % order.length]!.i]! += 1
  while (counts.reduce((a, b) => a + b, 0) > total) counts[counts.indexOf(Math.max(...counts))]! -= 1
  return new Map(kinds.map((k, i) => [k.name, counts[i]!]))
}

interface Traffic {
  seeded: Seeded
  photoIds: number[]
  listPaths: string[]
  keyPrefix: string
  acknowledged: number[]
  replayed: number
  slices: Map<string, Seeded['writable']>
}
const pick = <T>(xs: T[]) => xs[Math.floor(Math.random() * xs.length)]!

/** What connection `conn` of a kind sends next: each installer connection signs off its own share of the coverings. */
function nextRequest(kind: KindName, conn: number, conns: number, n: number, t: Traffic): { path: string, body?: string } {
  const { seeded: s } = t
  if (kind === 'lists') {
    const r = Math.random()
    if (r < 0.2) return { path: '/api/sites?page=1&pageSize=20&sort=name' }
    if (r < 0.35) return { path: `/api/coverings?siteId=${pick(s.siteIds)}&verdict=non_compliant&page=1&pageSize=${LIST_PAGE_SIZE}&sort=-lastInspectedAt` }
    return { path: pick(t.listPaths) }
  }
  if (kind === 'covering') return { path: `/api/coverings/${pick(s.coveringIds)}` }
  if (kind === 'thumbnails') return { path: `/api/photos/${pick(t.photoIds)}/thumb` }
  const mix = pickMix(Math.random)
  const loop = 20 + Math.round(Math.random() * 300)
  if (kind === 'checks') {
    const record = { ref: `CHK-${conn}-${n}`, jurisdiction: 'AU', premises: 'rental_home', installedOn: '2025-03-14', productType: mix.product, control: mix.control, madeTo: 'custom', ...mix.measures }
    if ('loopPullOutMm' in record) record.loopPullOutMm = loop
    return { path: '/api/checks', body: JSON.stringify(record) }
  }
  const mine = t.slices.get(`${conn}/${conns}`) ?? t.slices.set(`${conn}/${conns}`, s.writable.filter((_, i) => i % conns === conn)).get(`${conn}/${conns}`)!
  const target = mine[n % mine.length]!
  const measurements: Record<string, unknown> = { ...target.mix.measures }
  if ('loopPullOutMm' in measurements) measurements.loopPullOutMm = loop
  return { path: `/api/coverings/${target.id}/inspections`, body: JSON.stringify({ kind: 'fitting', measurements, photoIds: [], clientKey: `${t.keyPrefix}-${conn}-${n}` }) }
}

interface Outcome { kind: Kind, connections: number, result: autocannon.Result, latenciesMs: number[] }

/** One autocannon per kind, all at once; every connection carries a session of its own. */
async function runMix(base: string, seconds: number, conns: Map<KindName, number>, cookies: Record<'officer' | 'installer', string[]>, t: Traffic) {
  const used = { officer: 0, installer: 0 }
  return Promise.all(kinds.map(kind => new Promise<Outcome>((resolve, reject) => {
    const connections = conns.get(kind.name)!
    const latenciesMs: number[] = []
    let conn = 0
    const instance = autocannon({
      url: base, connections, duration: seconds, timeout: 10,
      setupClient: (client) => {
        const mine = conn++
        const cookie = cookies[kind.role][used[kind.role]++ % cookies[kind.role].length]!
        let n = 0
        client.setRequests([{
          method: kind.method,
          headers: { cookie: cookie, accept: 'application/json', ...(kind.method === 'POST' ? { 'content-type': 'application/json' } : {}) },
          setupRequest: req => ({ ...req, ...nextRequest(kind.name, mine, connections, n++, t) }),
          onResponse: kind.name === 'inspections'
            ? (status, body) => {
                if (status < 200 || status >= 300) return
                // An acknowledgement without a readable id still counts, as an id no row can have.
                let answer = { id: -1, replayed: false }
                try { answer = JSON.parse(body) }
                catch { /* counted below */ }
                t.acknowledged.push(answer.id)
                if (answer.replayed) t.replayed++
              }
            : undefined,
        }])
      },
    }, (err, result) => err ? reject(err) : resolve({ kind, connections, result, latenciesMs }))
    instance.on('response', (_client, _status, _bytes, ms) => latenciesMs.push(ms))
  })))
}

/** One route alone, at every connection, for the comparison with the bare handler. */
function runOne(base: string, seconds: number, connections: number, headersFor: (conn: number) => Record<string, string>, pathOf: () => string) {
  return new Promise<{ result: autocannon.Result, latenciesMs: number[] }>((resolve, reject) => {
    const latenciesMs: number[] = []
    let conn = 0
    const instance = autocannon({
      url: base, connections, duration: seconds, timeout: 10,
      setupClient: client => client.setRequests([{ method: 'GET', headers: headersFor(conn++), setupRequest: req => ({ ...req, path: pathOf() }) }]),
    }, (err, result) => err ? reject(err) : resolve({ result, latenciesMs }))
    instance.on('response', (_client, _status, _bytes, ms) => latenciesMs.push(ms))
  })
}

// ——— figures ———

function percentile(sorted: Float64Array, p: number) {
  if (!sorted.length) return Number.NaN
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!
}
const sortedCopy = (xs: number[]) => Float64Array.from(xs).sort()
const ms = (x: number) => Number.isNaN(x) ? '–' : x.toFixed(1)
const int = (x: number) => Math.round(x).toLocaleString('en-GB')
const met = (ok: boolean) => ok ? 'met' : 'NOT met'
const errorsOf = (r: autocannon.Result) => r.errors + r.non2xx

/** Server-side time per kind from the request log (from the request hook to the response): what the process spent on it. */
async function serverTimes(logFile: string, from: Date, to: Date) {
  const byKind = new Map<KindName, number[]>()
  const routes: Array<[RegExp, KindName]> = [[/^\/api\/(sites|coverings)$/, 'lists'], [/^\/api\/coverings\/\d+$/, 'covering'], [/^\/api\/checks$/, 'checks'],
    [/^\/api\/coverings\/\d+\/inspections$/, 'inspections'], [/^\/api\/photos\/\d+\/thumb$/, 'thumbnails']]
  const kindOf = (path: string) => routes.find(([pattern]) => pattern.test(path))?.[1] ?? null
  const text = existsSync(logFile) ? await readFile(logFile, 'utf8') : ''
  for (const line of text.split('\n')) {
    if (!line.startsWith('{')) continue
    const entry = JSON.parse(line) as { t: string, path?: string, ms?: number | null }
    const at = new Date(entry.t)
    const kind = entry.path ? kindOf(entry.path) : null
    if (!kind || typeof entry.ms !== 'number' || at < from || at > to) continue
    if (!byKind.has(kind)) byKind.set(kind, [])
    byKind.get(kind)!.push(entry.ms)
  }
  return new Map([...byKind].map(([k, xs]) => [k, sortedCopy(xs)]))
}

/** CPU time each process has used so far, in seconds (Linux /proc); one that has ended is left out. */
const clockTicks = Number(spawnSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).stdout.trim()) || 100
function cpuSeconds(pids: number[]) {
  const used = new Map<number, number>()
  for (const pid of pids) {
    try {
      const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')
      used.set(pid, (Number(fields[11]) + Number(fields[12])) / clockTicks)
    }
    catch { /* ended */ }
  }
  return used
}
/** CPU seconds used between two readings: all of it for a process that started in between. */
const cpuBetween = (before: Map<number, number>, after: Map<number, number>) => [...after].reduce((n, [pid, s]) => n + s - (before.get(pid) ?? 0), 0)

async function postgresPids(client: pg.Client) {
  const r = await client.query(`SELECT pid FROM pg_stat_activity WHERE datname = $1 OR backend_type IN ('walwriter', 'checkpointer', 'background writer')`, [DATABASE])
  return r.rows.map(row => row.pid as number)
}

/** Busy CPU seconds of the whole machine so far (Linux /proc/stat: everything but idle and iowait). */
function machineBusySeconds() {
  const n = readFileSync('/proc/stat', 'utf8').split('\n')[0]!.trim().split(/\s+/).slice(1, 9).map(Number)
  return (n.reduce((a, b) => a + b, 0) - n[3]! - n[4]!) / clockTicks
}

/** From now on: CPU seconds per group of processes, of this process (the load generator) and of everything else. */
async function cpuMeter(groups: () => Promise<Record<string, number[]>>) {
  const before = new Map(Object.entries(await groups()).map(([k, pids]) => [k, cpuSeconds(pids)]))
  const [machine, self] = [machineBusySeconds(), process.cpuUsage()]
  return async () => {
    const used: Record<string, number> = {}
    for (const [k, pids] of Object.entries(await groups())) used[k] = cpuBetween(before.get(k) ?? new Map(), cpuSeconds(pids))
    const own = process.cpuUsage(self)
    used.generator = (own.user + own.system) / 1e6
    used.other = Math.max(0, machineBusySeconds() - machine - Object.values(used).reduce((a, b) => a + b, 0))
    return used
  }
}

function s3Pid() {
  const file = join(root, '.data', 'dev', 's3.pid')
  return process.env.S3_ENDPOINT?.endsWith(':4569') && existsSync(file) ? [Number(readFileSync(file, 'utf8'))] : []
}

// ——— the run ———

async function main() {
  const seconds = Number(values.duration)
  const connections = Number(values.connections)
  const compareSeconds = Math.min(Number(values.compare), seconds)
  if (!Number.isInteger(seconds) || seconds < 1 || !Number.isInteger(connections) || connections < kinds.length || !Number.isInteger(compareSeconds) || compareSeconds < 1) {
    console.error(`usage: tsx scripts/bench/load.ts [--duration seconds] [--connections n ≥ ${kinds.length}] [--compare seconds]`)
    process.exit(2)
  }
  for (const name of ['S3_ENDPOINT', 'S3_BUCKET']) {
    if (!process.env[name]) {
      console.error(`${name} is not set: export what \`node scripts/run.mjs services dev\` prints, then run this again`)
      process.exit(2)
    }
  }
  mkdirSync(benchDir, { recursive: true })
  const loadBefore = loadavg()
  let server: ChildProcess | undefined
  let bare: ChildProcess | undefined
  let url: string | undefined
  let bundle: string | undefined
  let cleaned = false
  const cleanUp = async () => {
    if (cleaned) return
    cleaned = true
    await Promise.all([stopChild(server), stopChild(bare)])
    if (url) {
      const db = new pg.Client({ connectionString: url })
      await db.connect()
      const { rows } = await db.query<{ key: string }>('SELECT object_key AS key FROM photos UNION ALL SELECT thumb_key FROM photos WHERE thumb_key IS NOT NULL')
      await db.end()
      await inParallel(rows, 8, async ({ key }) => { await deleteObject(key).catch(() => {}) })
      const admin = new pg.Client({ connectionString: Object.assign(new URL(url), { pathname: '/postgres' }).toString() })
      await admin.connect()
      await admin.query(`DROP DATABASE IF EXISTS ${DATABASE} WITH (FORCE)`)
      await admin.end()
    }
    if (bundle) rmSync(bundle, { recursive: true, force: true })
    rmSync(join(benchDir, 'load-bare-plan.json'), { force: true })
  }
  process.once('SIGINT', () => { cleanUp().finally(() => process.exit(130)) })

  try {
    bundle = await serverBundle()
    const t0 = performance.now()
    url = await scratchDatabase(DATABASE)
    const seededRegister = await seedRegister(url)
    const [appPort, barePort] = [await freePort(3300), await freePort(3301)]
    const base = `http://127.0.0.1:${appPort}`
    const requestLog = join(benchDir, 'load-requests.log')
    server = startServer(bundle, url, appPort, requestLog)
    await waitFor(`${base}/api/health`, 'the built server')

    const conns = split(connections)
    const officers = Math.max(connections, conns.get('lists')! + conns.get('covering')! + conns.get('thumbnails')!)
    const installers = conns.get('checks')! + conns.get('inspections')!
    const cookies = { officer: [] as string[], installer: [] as string[] }
    for (let i = 0; i < officers; i++) cookies.officer.push(await signIn(base, seededRegister.officerEmail))
    for (let i = 0; i < installers; i++) cookies.installer.push(await signIn(base, seededRegister.installerEmail))

    // Photos go in through the API, as an installer's phone sends them, so their thumbnails are the server's own.
    const random = seeded(0xf070)
    const photoIds: number[] = []
    for (let i = 0; i < PHOTOS; i++) {
      const form = new FormData()
      form.set('kind', i % 2 ? 'defect' : 'whole')
      form.set('file', new Blob([new Uint8Array(await photoJpeg(i, random))], { type: 'image/jpeg' }), `load-${i}.jpg`)
      const coveringId = seededRegister.coveringIds[Math.floor((i / PHOTOS) * seededRegister.coveringIds.length)]!
      const r = await fetch(`${base}/api/coverings/${coveringId}/photos`, { method: 'POST', headers: { cookie: cookies.installer[0]! }, body: form })
      if (r.status !== 201) throw new Error(`photo upload answered ${r.status}: ${await r.text()}`)
      photoIds.push(((await r.json()) as { id: number }).id)
    }

    const listPaths: string[] = []
    const listVariants: Array<{ siteId: number, page: number }> = []
    for (const siteId of seededRegister.siteIds) {
      for (let page = 1; page <= Math.ceil((UNITS_PER_SITE * OPENINGS_PER_UNIT * COVERINGS_PER_OPENING) / LIST_PAGE_SIZE); page++) {
        listVariants.push({ siteId, page })
        listPaths.push(`/api/coverings?siteId=${siteId}&page=${page}&pageSize=${LIST_PAGE_SIZE}&sort=ref`)
      }
    }
    const traffic: Traffic = { seeded: seededRegister, photoIds, listPaths, keyPrefix: 'first', acknowledged: [], replayed: 0, slices: new Map() }

    // Each kind once, before anything is timed: a kind that does not answer 2xx would make the figures meaningless.
    for (const kind of kinds) {
      const { path, body } = nextRequest(kind.name, 0, 1, 0, traffic)
      const cookie = cookies[kind.role][0]!
      const r = await fetch(base + path, { method: kind.method, headers: { cookie, ...(body ? { 'content-type': 'application/json' } : {}) }, body })
      if (r.status < 200 || r.status >= 300) throw new Error(`${kind.method} ${path} answered ${r.status}: ${(await r.text()).slice(0, 400)}`)
    }
    traffic.keyPrefix = 'warm'
    const setupSeconds = (performance.now() - t0) / 1000
    console.log(`load benchmark: ${seconds} s at ${connections} connections against the built server on ${base} (${cpus().length} cores)`)
    console.log(`scratch database ${DATABASE}: ${SITES} sites, ${int(seededRegister.coveringIds.length)} coverings each inspected once, ${PHOTOS} photos uploaded through the API; `
      + `${officers + installers} sessions (officer ${officers}, installer ${installers}); set up in ${setupSeconds.toFixed(1)} s`)
    console.log(`load average before (1/5/15 min): ${loadBefore.map(x => x.toFixed(2)).join(' / ')}${existsSync(testLock) && pidAlive(testLock) ? '; a test run is in progress on this machine' : ''}`)

    // A test run started meanwhile shares the 2 cores: noted, so disturbed figures are known as such.
    let testRunSeen = false
    const watch = setInterval(() => { testRunSeen ||= existsSync(testLock) && pidAlive(testLock) }, 1000).unref()
    // A few seconds of the same mix first, so the figures are of a warm process (its writes are counted apart).
    await runMix(base, 3, conns, cookies, traffic)

    const probe = new pg.Client({ connectionString: url })
    await probe.connect()
    traffic.keyPrefix = 'load'
    traffic.acknowledged = []
    traffic.replayed = 0
    const serverPid = server.pid!
    const meter = await cpuMeter(async () => ({ server: [serverPid], postgres: await postgresPids(probe), s3: s3Pid() }))
    const from = new Date()
    const outcomes = await runMix(base, seconds, conns, cookies, traffic)
    const to = new Date()
    const cpu = await meter()
    const loadDuring = loadavg()

    // Lost writes: every acknowledged inspection must be in the database; rows nobody heard back about are counted too.
    await new Promise(r => setTimeout(r, 1000))
    const written = await probe.query<{ rows: number, found: number }>(`SELECT count(*) FILTER (WHERE client_key LIKE 'load-%')::int AS rows,
      count(*) FILTER (WHERE id = ANY($1::int[]))::int AS found FROM inspections`, [traffic.acknowledged])
    const { rows: writtenRows, found } = written.rows[0]!

    // The bare handler's statements: exactly what the route sends, taken from Sequelize's own log of them.
    const captured: string[] = []
    // Both services send raw SQL, so a plain connection with logging on is all they need.
    const logged = new Sequelize(url, { dialect: 'postgres', dialectModule: pg, pool: { max: 1 }, logging: (sql: string) => { captured.push(sql.replace(/^Executing \([^)]*\): /, '')) } })
    const officerRow = (await probe.query<{ id: number }>('SELECT id FROM users WHERE email = $1', [seededRegister.officerEmail])).rows[0]!
    const actor = { id: officerRow.id, role: 'officer' as const, workspaceId: seededRegister.workspaceId, clientId: null }
    const plan: BarePlan = { sessions: [], pages: [] }
    const sessionRows = (await probe.query<{ id: string }>('SELECT id FROM user_sessions WHERE user_id = $1 ORDER BY created_at', [officerRow.id])).rows
    for (const { id } of sessionRows) {
      captured.length = 0
      await sessionUser(logged, id, officerRow.id)
      plan.sessions.push(captured[0]!)
    }
    for (const v of listVariants) {
      captured.length = 0
      await listCoverings(logged, actor, { siteId: v.siteId, page: v.page, pageSize: LIST_PAGE_SIZE, sort: 'ref' })
      const [items, count] = [captured.find(q => q.includes(' LIMIT ')), captured.find(q => q.includes('count(*)::int AS total'))]
      if (!items || !count) throw new Error(`the coverings list sent ${captured.length} statements, not the page and the count`)
      plan.pages.push({ items, count, page: v.page, pageSize: LIST_PAGE_SIZE })
    }
    await logged.close()
    const planFile = join(benchDir, 'load-bare-plan.json')
    await writeFile(planFile, JSON.stringify(plan))
    bare = spawn(process.execPath, [bundled(script), '--part', 'bare', '--url', url, '--port', String(barePort), '--plan', planFile], { cwd: root, stdio: ['ignore', 'pipe', 'inherit'] })
    await new Promise<void>((resolve, reject) => {
      bare!.stdout!.once('data', () => resolve())
      bare!.once('exit', code => reject(new Error(`the bare handler stopped (exit ${code})`)))
    })
    const bareBase = `http://127.0.0.1:${barePort}`
    const variant = () => Math.floor(Math.random() * listVariants.length)
    const appList = async (s: number) => runOne(base, s, connections, c => ({ cookie: cookies.officer[c % cookies.officer.length]!, accept: 'application/json' }), () => listPaths[variant()]!)
    const bareList = async (s: number) => runOne(bareBase, s, connections, c => ({ 'x-session': String(c % plan.sessions.length), 'accept': 'application/json' }), () => `/?v=${variant()}`)
    // Metered apart: a process that ends within a window (the pool closes idle connections) takes its CPU time along.
    const barePid = bare.pid!
    const appMeter = await cpuMeter(async () => ({ server: [serverPid], postgres: await postgresPids(probe) }))
    await appList(2)
    const app = await appList(compareSeconds)
    const appCpu = await appMeter()
    const bareMeter = await cpuMeter(async () => ({ bare: [barePid], postgres: await postgresPids(probe) }))
    await bareList(2)
    const bareRun = await bareList(compareSeconds)
    const bareCpu = await bareMeter()
    await probe.end()
    await stopChild(bare)
    clearInterval(watch)
    const loadAfter = loadavg()

    // ——— print ———
    const server_ = await serverTimes(requestLog, from, to)
    const head = `${'kind'.padEnd(26)}${'conns'.padStart(6)}${'requests'.padStart(10)}${'req/s'.padStart(9)}${'p50 ms'.padStart(9)}${'p99 ms'.padStart(9)}${'max ms'.padStart(9)}`
      + `${'errors'.padStart(8)}${'non-2xx'.padStart(9)}${'server p50/p99 ms'.padStart(20)}`
    console.log(`\n${head}`)
    const line = (label: string, c: number, total: number, duration: number, sorted: Float64Array, errors: number, non2xx: number, serverSide?: Float64Array) =>
      console.log(`${label.padEnd(26)}${String(c).padStart(6)}${int(total).padStart(10)}${(total / duration).toFixed(1).padStart(9)}${ms(percentile(sorted, 50)).padStart(9)}`
        + `${ms(percentile(sorted, 99)).padStart(9)}${ms(sorted.length ? sorted[sorted.length - 1]! : Number.NaN).padStart(9)}${int(errors).padStart(8)}${int(non2xx).padStart(9)}`
        + `${(serverSide ? `${ms(percentile(serverSide, 50))} / ${ms(percentile(serverSide, 99))}` : '').padStart(20)}`)
    let all: number[] = []
    let reads: number[] = []
    for (const o of outcomes) {
      const sorted = sortedCopy(o.latenciesMs)
      all = all.concat(o.latenciesMs)
      if (o.kind.read) reads = reads.concat(o.latenciesMs)
      line(o.kind.label, o.connections, o.result.requests.total, o.result.duration, sorted, o.result.errors, o.result.non2xx, server_.get(o.kind.name))
    }
    const duration = Math.max(...outcomes.map(o => o.result.duration))
    const sum = (f: (r: autocannon.Result) => number) => outcomes.reduce((n, o) => n + f(o.result), 0)
    line('all', connections, sum(r => r.requests.total), duration, sortedCopy(all), sum(r => r.errors), sum(r => r.non2xx))
    const readsSorted = sortedCopy(reads)
    line('reads (GET kinds together)', outcomes.filter(o => o.kind.read).reduce((n, o) => n + o.connections, 0), readsSorted.length, duration, readsSorted,
      outcomes.filter(o => o.kind.read).reduce((n, o) => n + o.result.errors, 0), outcomes.filter(o => o.kind.read).reduce((n, o) => n + o.result.non2xx, 0))

    const readP99 = percentile(readsSorted, 99)
    const errors = sum(errorsOf)
    const acknowledged = traffic.acknowledged.length
    const lost = acknowledged - found
    const codes = outcomes.flatMap(o => Object.entries(o.result.statusCodeStats ?? {}).filter(([code]) => !code.startsWith('2')).map(([code, s]) => `${o.kind.name} ${code} ×${s.count}`))
    console.log(`\nreads p99: ${ms(readP99)} ms (goal ≤ ${GOALS.readP99Ms} ms) ${met(readP99 <= GOALS.readP99Ms)}; worst kind ${outcomes.filter(o => o.kind.read)
      .map(o => ({ label: o.kind.label, p99: percentile(sortedCopy(o.latenciesMs), 99) })).sort((a, b) => b.p99 - a.p99).map(k => `${k.label} ${ms(k.p99)} ms`)[0]}`)
    console.log(`errors: ${errors} (connection errors ${sum(r => r.errors - r.timeouts)}, timeouts ${sum(r => r.timeouts)}, non-2xx ${sum(r => r.non2xx)}${codes.length ? `: ${codes.join(', ')}` : ''}) `
      + `(goal ${GOALS.errors}) ${met(errors <= GOALS.errors)}`)
    console.log(`inspection writes: ${int(acknowledged)} acknowledged (2xx${traffic.replayed ? `, ${traffic.replayed} replayed` : ''}), ${int(found)} of them in the database, lost ${lost} (goal ${GOALS.lostWrites}) `
      + `${met(lost <= GOALS.lostWrites)}; rows written ${int(writtenRows)} (${writtenRows - found} with no answer heard: in flight when the clock stopped)`)
    console.log(`CPU used in the ${duration.toFixed(0)} s (of ${(duration * cpus().length).toFixed(0)} core-seconds): server ${cpu.server!.toFixed(1)} s, PostgreSQL ${cpu.postgres!.toFixed(1)} s, `
      + `S3 fake ${cpu.s3!.toFixed(1)} s, load generator ${cpu.generator!.toFixed(1)} s, anything else ${cpu.other!.toFixed(1)} s; load average at the end ${loadDuring.map(x => x.toFixed(2)).join(' / ')}`)

    const appSorted = sortedCopy(app.latenciesMs)
    const bareSorted = sortedCopy(bareRun.latenciesMs)
    const appRps = app.result.requests.total / app.result.duration
    const bareRps = bareRun.result.requests.total / bareRun.result.duration
    console.log(`\nbaseline, ${compareSeconds} s each at ${connections} connections, one after the other: GET /api/coverings?siteId&page (${LIST_PAGE_SIZE} a page) through the app, against a bare`)
    console.log('node:http handler sending the same 3 statements through pg (session check, page, count; taken from Sequelize\'s log of the route):')
    console.log(`  app   ${appRps.toFixed(1).padStart(8)} req/s   p50 ${ms(percentile(appSorted, 50)).padStart(6)} ms   p99 ${ms(percentile(appSorted, 99)).padStart(6)} ms   errors ${errorsOf(app.result)}`)
    console.log(`  bare  ${bareRps.toFixed(1).padStart(8)} req/s   p50 ${ms(percentile(bareSorted, 50)).padStart(6)} ms   p99 ${ms(percentile(bareSorted, 99)).padStart(6)} ms   errors ${errorsOf(bareRun.result)}`)
    console.log(`  ratio app / bare: req/s ${(appRps / bareRps).toFixed(2)}×, p50 ${(percentile(appSorted, 50) / percentile(bareSorted, 50)).toFixed(2)}×, p99 ${(percentile(appSorted, 99) / percentile(bareSorted, 99)).toFixed(2)}×`)
    const window = `${2 + compareSeconds} s with its warm-up`
    console.log(`  CPU, app's ${window}: server ${appCpu.server!.toFixed(1)} s, PostgreSQL ${appCpu.postgres!.toFixed(1)} s, load generator ${appCpu.generator!.toFixed(1)} s, anything else ${appCpu.other!.toFixed(1)} s`)
    console.log(`  CPU, bare's ${window}: bare ${bareCpu.bare!.toFixed(1)} s, PostgreSQL ${bareCpu.postgres!.toFixed(1)} s, load generator ${bareCpu.generator!.toFixed(1)} s, anything else ${bareCpu.other!.toFixed(1)} s`)
    // Other work on the machine above 5 % of its capacity shows in the figures.
    const elsewhere = cpu.other! / (duration * cpus().length) > 0.05 || (appCpu.other! + bareCpu.other!) / (4 + 2 * compareSeconds) / cpus().length > 0.05
    const busy = [testRunSeen ? 'a test run shared the machine during it' : '',
      elsewhere ? `other processes used ${cpu.other!.toFixed(1)} s of CPU during the mix and ${(appCpu.other! + bareCpu.other!).toFixed(1)} s during the baseline` : ''].filter(Boolean)
    console.log(`load average after: ${loadAfter.map(x => x.toFixed(2)).join(' / ')}${busy.length ? ` (${busy.join('; ')}: figures may be disturbed)` : ''}`)
    console.log(`request log: ${requestLog}`)
  }
  finally {
    await cleanUp()
  }
}

if (values.part === 'bare') await bareServer()
else await main()
