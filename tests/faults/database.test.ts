import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { uploadPhoto } from '../support/photos'
import { embeddedPostgres } from '../support/server'

// PostgreSQL is stopped and started again while installers sign off inspections and officers read lists. The
// requests in the gap must fail fast with 503 and say why; the server must recover by itself within 5 s of the
// database coming back; and every write the server acknowledged must be in the database afterwards.
// This file runs after every other test file (vitest project `faults`), so the restart disturbs no one.

const pg = embeddedPostgres()
const measurements = {
  headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900,
  tensionDeviceHoldN: 80, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false,
}

interface Sample { kind: 'read' | 'write', start: number, end: number, status: number, message: string, id?: number, clientKey?: string }

describe.skipIf(!pg)('PostgreSQL restarted under load', () => {
  let installer: ApiClient
  let officer: ApiClient
  let coveringId = 0
  let photoId = 0
  let siteId = 0

  beforeAll(async () => {
    const db = await database()
    const ids = await fixtureIds(db)
    await db.end()
    coveringId = ids.own.covering
    siteId = ids.own.site
    installer = await signIn(accounts.installer)
    officer = await signIn(accounts.officer)
    photoId = (await uploadPhoto(installer, coveringId, 'tension_device')).id
  })

  afterAll(() => {
    // Whatever happened above, leave the database running.
    if (pg && pg.pgCtl('status').status !== 0) pg.pgCtl('-l', join(process.env.TEST_DATA_DIR!, 'pglog', 'server.log'), '-w', '-t', '60', 'start')
  })

  it('answers 503 fast during the outage, recovers within 5 s, and loses no acknowledged write', async () => {
    const samples: Sample[] = []
    let running = true
    let seq = 0
    const record = async (kind: Sample['kind'], send: () => Promise<{ status: number, body: any }>, clientKey?: string) => {
      const start = performance.now()
      let status = 0
      let body: any = null
      try { ({ status, body } = await send()) }
      catch (err) { body = { message: `no answer: ${(err as Error).message}` } }
      samples.push({ kind, start, end: performance.now(), status, message: String(body?.message ?? ''), id: status < 300 ? body?.id : undefined, clientKey })
    }
    const writer = async () => {
      while (running) {
        const clientKey = `restart-${process.pid}-${++seq}`
        await record('write', () => installer.post(`/api/coverings/${coveringId}/inspections`, { kind: 'fitting', measurements, photoIds: [photoId], clientKey }), clientKey)
      }
    }
    const reader = async (i: number) => {
      const paths = [`/api/sites?page=1&pageSize=25`, `/api/coverings/${coveringId}`, `/api/coverings?siteId=${siteId}&page=1&pageSize=25`]
      let n = i
      while (running) await record('read', () => officer.get(paths[n++ % paths.length]!))
    }
    const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))
    const load = [writer(), writer(), writer(), writer(), reader(0), reader(1), reader(2), reader(3)]

    await sleep(1500)
    const stopped = pg!.pgCtl('-m', 'fast', '-w', '-t', '60', 'stop')
    expect(stopped.status, stopped.output).toBe(0)
    const down = performance.now()
    await sleep(2500)
    const health = await fetch(`${installer.base}/api/health`)
    expect(health.status).toBe(503)
    expect(await health.json()).toMatchObject({ database: 'down' })
    const restarting = performance.now()
    const started = pg!.pgCtl('-l', join(process.env.TEST_DATA_DIR!, 'pglog', 'server.log'), '-w', '-t', '60', 'start')
    expect(started.status, started.output).toBe(0)
    const up = performance.now()
    await sleep(7000)
    running = false
    await Promise.all(load)

    // Every answer was a success or a 503: nothing else, no dropped connection.
    const statuses = new Set(samples.map(s => s.status))
    expect([...statuses].filter(s => ![200, 201, 503].includes(s)), JSON.stringify(samples.filter(s => ![200, 201, 503].includes(s.status)).slice(0, 3))).toEqual([])

    // During the outage: only 503s, each with a message saying why, each within a second.
    const inOutage = samples.filter(s => s.start >= down && s.end <= restarting)
    expect(inOutage.length).toBeGreaterThan(20)
    for (const s of inOutage) {
      expect(s.status).toBe(503)
      expect(s.message).toMatch(/database is unreachable just now; try again/)
      expect(s.end - s.start).toBeLessThan(1000)
    }

    // Recovery: from the moment PostgreSQL takes connections again, the first success comes within 5 s, and
    // everything sent after that succeeds.
    const after = samples.filter(s => s.start >= up)
    const firstOk = after.find(s => s.status < 300)
    expect(firstOk, 'no request succeeded after the restart').toBeDefined()
    expect(firstOk!.end - up).toBeLessThan(5000)
    const settled = after.filter(s => s.start >= firstOk!.end)
    expect(settled.length).toBeGreaterThan(20)
    expect(settled.filter(s => s.status >= 300)).toEqual([])

    // No acknowledged write is missing.
    const acknowledged = samples.filter(s => s.kind === 'write' && (s.status === 201 || s.status === 200))
    expect(acknowledged.length).toBeGreaterThan(20)
    const db = await database()
    const { rows } = await db.query<{ id: number, client_key: string }>('SELECT id, client_key FROM inspections WHERE covering_id = $1 AND client_key = ANY($2)',
      [coveringId, acknowledged.map(s => s.clientKey)])
    await db.end()
    const stored = new Map(rows.map(r => [r.client_key, Number(r.id)]))
    const missing = acknowledged.filter(s => stored.get(s.clientKey!) !== s.id)
    expect(missing).toEqual([])
    console.info(`[faults] ${samples.length} requests; ${inOutage.length} during the outage, all 503, slowest ${Math.round(Math.max(...inOutage.map(s => s.end - s.start)))} ms; `
      + `first success ${Math.round(firstOk!.end - up)} ms after PostgreSQL was back; ${acknowledged.length} acknowledged writes, ${missing.length} missing`)
  }, 60_000)
})
