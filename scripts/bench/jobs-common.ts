// Shared by scripts/bench/import.ts and scripts/bench/recheck.ts: a scratch database, plain COPY for the
// SQL baselines, a peak-memory probe and a seeded generator. Benchmarks print; they never fail on time.
import { spawnSync } from 'node:child_process'
import { mkdirSync } from 'node:fs'
import { basename, dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import pg from 'pg'
import { createSequelize, migrator } from '../../server/db'
import { Client, User, Workspace } from '../../server/models'

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..')

/** A fresh database next to DATABASE_URL's, so runs are alike and the dev data is never touched. */
export async function scratchDatabase(name: string) {
  const base = process.env.DATABASE_URL
  if (!base) {
    console.error('DATABASE_URL is not set: export what `node scripts/run.mjs services dev` prints, then run this again')
    process.exit(2)
  }
  const url = new URL(base)
  const admin = new pg.Client({ connectionString: Object.assign(new URL(base), { pathname: '/postgres' }).toString() })
  await admin.connect()
  await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
  await admin.query(`CREATE DATABASE ${name}`)
  await admin.end()
  url.pathname = `/${name}`
  const db = createSequelize(url.toString(), { poolMax: 4 })
  await migrator(db).up()
  await db.close()
  return url.toString()
}

/** One workspace with a client and an officer to act as, in the scratch database. */
export async function benchTenant(db: ReturnType<typeof createSequelize>, name: string) {
  const workspace = await Workspace.create({ name, contactPhone: null, contactEmail: 'bench@tautline.test', address: null, licenceNumber: null })
  const client = await Client.create({ workspaceId: workspace.id, name: `${name} client`, contactName: null, reportEmail: 'bench-client@tautline.test', phone: null })
  const user = await User.create({ workspaceId: workspace.id, clientId: null, email: `bench-${workspace.id}@tautline.test`, name: 'Bench Officer', role: 'officer', passwordHash: null, lastSignInAt: null })
  return { workspace, client, actor: { id: user.id, role: user.role, workspaceId: workspace.id, clientId: null } }
}

export { copyInto } from '../../server/services/pg-copy'

/** Samples RSS while work runs; reports the highest, with the process's own high-water mark. */
export async function measured<T>(work: () => Promise<T>) {
  let peak = process.memoryUsage().rss
  const timer = setInterval(() => { peak = Math.max(peak, process.memoryUsage().rss) }, 5)
  const started = performance.now()
  try {
    const result = await work()
    return { result, ms: performance.now() - started, peakRssMb: Math.max(peak, process.memoryUsage().rss) / 1048576 }
  }
  finally {
    clearInterval(timer)
  }
}

/**
 * Bundles a benchmark script into plain JavaScript (under .data/bench), so its parts run in `node` without the
 * TypeScript loader: that loader alone takes some 50 MB, which the server, built by Nuxt, never carries.
 */
export function bundled(script: string) {
  const out = join(root, '.data', 'bench', `${basename(script, '.ts')}.mjs`)
  mkdirSync(dirname(out), { recursive: true })
  const r = spawnSync(join(root, 'node_modules', '.bin', 'esbuild'), [script, '--bundle', '--platform=node', '--format=esm', '--packages=external', `--outfile=${out}`, '--log-level=warning'], { encoding: 'utf8' })
  if (r.status !== 0) throw new Error(`bundling ${script} failed:\n${r.stderr}`)
  return out
}

/** Runs one part of a benchmark in a process of its own, so the part's memory is its own; returns what it printed last, as JSON. */
export function runPart<T>(bundle: string, args: string[]): T {
  const r = spawnSync(process.execPath, [bundle, ...args], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 })
  if (r.status !== 0) throw new Error(`${args.join(' ')} failed:\n${r.stderr}`)
  const line = r.stdout.trim().split('\n').pop()!
  return JSON.parse(line) as T
}

export function seeded(start: number) {
  let seed = start
  return () => {
    seed = (seed + 0x6d2b79f5) | 0
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed)
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

const labelsOk = { warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true }
/** Measurement sets a fitter would record (mm, N), with the share of coverings that get each. */
export const measureMixes: Array<{ share: number, control: string, product: string, measures: Record<string, number | boolean | null> }> = [
  { share: 0.35, control: 'chain_loop', product: 'roller', measures: { headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, tensionDevice: true, tensionDeviceHeightMm: 880, tensionDeviceHoldN: 85, tensionDeviceTamperProof: true, ...labelsOk } },
  { share: 0.15, control: 'chain_loop', product: 'vertical', measures: { headHeightMm: 2150, lowestCordPointMm: 1020, loopPullOutMm: 310, tensionDevice: false, ...labelsOk } },
  { share: 0.1, control: 'chain_loop', product: 'roller', measures: { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 210, tensionDevice: false, ...labelsOk } },
  { share: 0.1, control: 'free_cord', product: 'venetian', measures: { headHeightMm: 2200, lowestCordPointMm: 1150, freeCordLengthMm: 1000, cleat: true, cleatHeightMm: 1150, tensionDevice: false, ...labelsOk } },
  { share: 0.1, control: 'chain_loop', product: 'roller', measures: { headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, tensionDevice: true, tensionDeviceHeightMm: 900, tensionDeviceHoldN: null, ...labelsOk } },
  { share: 0.2, control: 'wand', product: 'venetian', measures: { headHeightMm: 2100, innerCordStops: true, ...labelsOk } },
]
export function pickMix(random: () => number) {
  let r = random()
  for (const m of measureMixes) if ((r -= m.share) < 0) return m
  return measureMixes[0]!
}

export const mb = (n: number) => `${n.toFixed(0)} MB`
export const sec = (ms: number) => `${(ms / 1000).toFixed(2)} s`
