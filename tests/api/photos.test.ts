import { createHash } from 'node:crypto'
import { GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { hostileImages, jpegTakenAt, testPng, uploadPhoto } from '../support/photos'

const s3 = new S3Client({
  endpoint: process.env.S3_ENDPOINT, region: process.env.S3_REGION ?? 'us-east-1', forcePathStyle: true,
  credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' },
})
const bucket = process.env.S3_BUCKET ?? 'tautline-photos'
const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex')

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let installer: ApiClient
let manager2: ApiClient

async function objectCount() {
  let n = 0
  let token: string | undefined
  do {
    const r = await s3.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }))
    n += r.KeyCount ?? 0
    token = r.NextContinuationToken
  } while (token)
  return n
}
const photoRows = async () => (await db.query('SELECT count(*)::int AS n FROM photos')).rows[0].n as number

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  installer = await signIn(accounts.installer)
  manager2 = await signIn(accounts.manager2)
})
afterAll(async () => { await db.end() })

describe('photos are evidence kept in S3', () => {
  it('stores the photo with its SHA-256, EXIF capture time and a thumbnail', async () => {
    const jpeg = await sharp({ create: { width: 1200, height: 900, channels: 3, background: '#7a6a55' } })
      .jpeg().withExif({ IFD0: { Make: 'TestCam' }, IFD2: { DateTimeOriginal: '2026:11:30 09:15:00' } }).toBuffer()
    const photo = await uploadPhoto(installer, ids.own.covering, 'tension_device', jpeg, 'IMG_0042.JPG')
    expect(photo.sha256).toBe(sha256(jpeg))
    const { rows: [row] } = await db.query('SELECT * FROM photos WHERE id = $1', [photo.id])
    expect(row).toMatchObject({ kind: 'tension_device', content_type: 'image/jpeg', size_bytes: jpeg.byteLength, file_name: 'IMG_0042.JPG', width_px: 1200, height_px: 900 })
    expect(new Date(row.captured_at).toISOString()).toMatch(/^2026-11-30T/)
    const stored = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: row.object_key }))
    expect(sha256(await stored.Body!.transformToByteArray())).toBe(row.sha256)
    const full = await fetch(`${process.env.TEST_BASE_URL}${photo.url}`, { headers: { cookie: installer.cookie! } })
    expect(full.headers.get('content-type')).toBe('image/jpeg')
    expect(sha256(new Uint8Array(await full.arrayBuffer()))).toBe(row.sha256)
    const thumb = await fetch(`${process.env.TEST_BASE_URL}${photo.thumbUrl}`, { headers: { cookie: installer.cookie! } })
    const meta = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata()
    expect(Math.max(meta.width!, meta.height!)).toBeLessThanOrEqual(480)
  })

  it('answers 415 for a text file named .jpg and leaves no row and no object', async () => {
    const [rows, objects] = [await photoRows(), await objectCount()]
    const form = new FormData()
    form.append('kind', 'whole')
    form.append('file', new Blob(['this is not a photo, only words\n'.repeat(20)], { type: 'image/jpeg' }), 'blind.jpg')
    const r = await installer.request('POST', `/api/coverings/${ids.own.covering}/photos`, form)
    expect(r.status).toBe(415)
    expect(r.body.message).toMatch(/^file: this is not a JPEG, PNG, WebP or HEIC photo/)
    expect(await photoRows()).toBe(rows)
    expect(await objectCount()).toBe(objects)
  })

  it('answers 413 for a photo over 15 MB and leaves no row and no object', async () => {
    const [rows, objects] = [await photoRows(), await objectCount()]
    const big = new Uint8Array(16 * 1024 * 1024)
    big.set(await testPng(8, 8))
    const form = new FormData()
    form.append('kind', 'whole')
    form.append('file', new Blob([big]), 'huge.png')
    const r = await installer.request('POST', `/api/coverings/${ids.own.covering}/photos`, form)
    expect(r.status).toBe(413)
    expect(await photoRows()).toBe(rows)
    expect(await objectCount()).toBe(objects)
  })

  it('names the kind when it is unknown', async () => {
    const form = new FormData()
    form.append('kind', 'selfie')
    form.append('file', new Blob([new Uint8Array(await testPng())]), 'a.png')
    const r = await installer.request('POST', `/api/coverings/${ids.own.covering}/photos`, form)
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^kind/)
  })

  it('answers 404 for another tenant\'s photo', async () => {
    const otherAdmin = await signIn(accounts.otherAdmin)
    const foreign = await uploadPhoto(otherAdmin, ids.other.covering)
    expect((await installer.get(`/api/photos/${foreign.id}`)).status).toBe(404)
    const mine = await uploadPhoto(installer, ids.own.covering)
    expect((await manager2.get(`/api/photos/${mine.id}`)).status).toBe(404)
    expect((await manager2.get(`/api/photos/${mine.id}/thumb`)).status).toBe(404)
  })

  it('refuses a new photo row without its decoded pixel size in the database', async () => {
    await expect(db.query(`INSERT INTO photos (workspace_id, site_id, covering_id, kind, object_key, content_type, size_bytes, sha256, uploaded_by)
      SELECT workspace_id, site_id, covering_id, kind, object_key || '.undecoded', content_type, size_bytes, sha256, uploaded_by FROM photos LIMIT 1`))
      .rejects.toThrow(/photos_decoded_size/)
  })

  it('refuses UPDATE and DELETE on photo rows in the database', async () => {
    const { rows: [row] } = await db.query('SELECT id FROM photos LIMIT 1')
    await expect(db.query(`UPDATE photos SET sha256 = 'x' WHERE id = $1`, [row.id])).rejects.toThrow(/evidence/)
    await expect(db.query('DELETE FROM photos WHERE id = $1', [row.id])).rejects.toThrow(/evidence/)
  })
})

async function sendPhoto(client: ApiClient, coveringId: number, data: Uint8Array, fileName: string, kind = 'whole', ms = 15_000) {
  const form = new FormData()
  form.append('kind', kind)
  form.append('file', new Blob([new Uint8Array(data)]), fileName)
  const started = performance.now()
  try {
    const res = await fetch(`${baseUrl}/api/coverings/${coveringId}/photos`, { method: 'POST', body: form, headers: { cookie: client.cookie!, accept: 'application/json' }, signal: AbortSignal.timeout(ms) })
    const body = await res.json().catch(() => null) as { id?: number, message?: string, data?: { fields?: Record<string, string> } } | null
    return { status: res.status, body, ms: performance.now() - started }
  }
  catch {
    return { status: 0, body: null, ms: performance.now() - started }
  }
}

describe('files that only look like photos', () => {
  it('are refused by content (413 over a limit, 415 otherwise) naming `file`, leave nothing behind, and never hold up anyone else', async () => {
    const files = await hostileImages()
    const [rows, objects] = [await photoRows(), await objectCount()]
    // Other people's requests, one after another, for as long as the hostile uploads last (and at least 1.5 s).
    const others: { path: string, status: number, ms: number }[] = []
    let uploading = true
    const probing = (async () => {
      const until = Date.now() + 1500
      while (uploading || Date.now() < until) {
        for (const path of ['/api/health', `/api/sites?pageSize=5`, `/api/coverings/${ids.own.covering}/photos`]) {
          const started = performance.now()
          const status = await fetch(baseUrl + path, { headers: { cookie: installer.cookie!, accept: 'application/json' }, signal: AbortSignal.timeout(5000) })
            .then(async (r) => { await r.arrayBuffer(); return r.status }, () => 0)
          others.push({ path, status, ms: performance.now() - started })
        }
        await new Promise(r => setTimeout(r, 25))
      }
    })()
    // Every file three times over, all at once.
    const rounds = await Promise.all([0, 1, 2].map(() => Promise.all(files.map(f => sendPhoto(installer, ids.own.covering, f.data, f.fileName, 'tension_device')))))
    uploading = false
    await probing
    for (const round of rounds.slice(1)) expect(round.map(a => a.status)).toEqual(rounds[0]!.map(a => a.status))
    const answers = rounds[0]!

    const got = files.map((f, i) => ({ name: f.name, status: answers[i]!.status, file: answers[i]!.body?.data?.fields?.file, message: answers[i]!.body?.message }))
    expect(got.map(g => `${g.name}: ${g.status}`)).toEqual(files.map(f => `${f.name}: ${f.status}`))
    for (const g of got) {
      expect(g.message, g.name).toMatch(/^file: /)
      expect(g.file, g.name).toBeTruthy()
    }
    // A HEIC file that cannot be read here says how to send the photo instead.
    expect(got[0]!.message).toMatch(/JPEG/)
    expect(await photoRows()).toBe(rows)
    expect(await objectCount()).toBe(objects)
    expect(others.length).toBeGreaterThan(10)
    expect(others.filter(o => o.status !== 200 || o.ms > 2000)).toEqual([])
    const slowest = Math.max(...others.map(o => o.ms))
    const slowestUpload = Math.max(...rounds.flat().map(a => a.ms))
    console.info(`hostile photo uploads: ${files.length} files × 3 at once, statuses ${got.map(g => g.status).join(' ')}, slowest refusal ${Math.round(slowestUpload)} ms; ${others.length} other requests meanwhile, slowest ${Math.round(slowest)} ms`)
  })

  it('refuses JPEG magic followed by HTML, so it can never stand as the tension device photo', async () => {
    const jpeg = await sharp({ create: { width: 96, height: 64, channels: 3, background: '#806040' } }).jpeg().toBuffer()
    const polyglot = Buffer.concat([jpeg.subarray(0, 55), Buffer.from('<html><body><p>Tension device fitted</p></body></html>')])
    const r = await sendPhoto(installer, ids.own.covering, polyglot, 'device.jpg', 'tension_device')
    expect(r.status).toBe(415)
    expect(r.body?.data?.fields?.file).toBeTruthy()
    expect((await db.query('SELECT count(*)::int AS n FROM photos WHERE sha256 = $1', [sha256(polyglot)])).rows[0].n).toBe(0)
  })

  it('records the decoded width and height of every stored photo, upright', async () => {
    const webp = await sharp({ create: { width: 300, height: 200, channels: 3, background: '#335577' } }).webp().toBuffer()
    const turned = await sharp({ create: { width: 400, height: 100, channels: 3, background: '#775533' } }).jpeg().withMetadata({ orientation: 6 }).toBuffer()
    for (const [data, name, w, h] of [[await testPng(64, 48, 7), 'a.png', 64, 48], [webp, 'b.webp', 300, 200], [turned, 'c.jpg', 100, 400]] as const) {
      const photo = await uploadPhoto(installer, ids.own.covering, 'whole', data, name)
      const { rows: [row] } = await db.query('SELECT width_px, height_px, thumb_key FROM photos WHERE id = $1', [photo.id])
      expect(row, name).toMatchObject({ width_px: w, height_px: h })
      expect(row.thumb_key, name).toBeTruthy()
    }
  })

  it('keeps a capture time that cannot be true (before 1990, after the upload, or not a date) as not read', async () => {
    const soon = new Date(Date.now() + 3 * 86_400_000)
    const future = `${soon.getFullYear()}:${String(soon.getMonth() + 1).padStart(2, '0')}:${String(soon.getDate()).padStart(2, '0')} 10:00:00`
    for (const when of ['9999:99:99 99:99:99', '1985:06:01 12:00:00', future, '2026:02:31 10:00:00', '2026:13:01 10:00:00']) {
      const photo = await uploadPhoto(installer, ids.own.covering, 'whole', await jpegTakenAt(when), 'odd-date.jpg')
      const { rows: [row] } = await db.query('SELECT captured_at, width_px FROM photos WHERE id = $1', [photo.id])
      expect(row.captured_at, when).toBeNull()
      expect(row.width_px, when).toBe(320)
    }
    const fine = await uploadPhoto(installer, ids.own.covering, 'whole', await jpegTakenAt('2025:07:14 16:20:05'), 'ok.jpg')
    const { rows: [row] } = await db.query('SELECT captured_at FROM photos WHERE id = $1', [fine.id])
    expect(new Date(row.captured_at).toISOString()).toMatch(/^2025-07-14T/)
  })
})

describe('sign-off', () => {
  const tensioned = {
    headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900,
    tensionDeviceHoldN: 80, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true,
    warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false, installedPerInstructions: true,
  }

  it('needs a photo of a fitted tension device', async () => {
    const r = await installer.post(`/api/coverings/${ids.own.covering}/inspections`, { kind: 'fitting', measurements: tensioned })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^photoIds: a covering with a tension device needs a photo/)
  })

  it('saves the inspection once with findings, photos and rule-set version, even when sent twice', async () => {
    const photo = await uploadPhoto(installer, ids.own.covering, 'tension_device')
    const body = { kind: 'fitting', measurements: tensioned, photoIds: [photo.id], clientKey: `draft-${Date.now()}` }
    const first = await installer.post(`/api/coverings/${ids.own.covering}/inspections`, body)
    expect(first.status).toBe(201)
    expect(first.body.verdict).toBe('compliant')
    expect(first.body.rulesVersion).toMatch(/^AU-/)
    const again = await installer.post(`/api/coverings/${ids.own.covering}/inspections`, body)
    expect(again.status).toBe(200)
    expect(again.body.id).toBe(first.body.id)
    const links = await db.query('SELECT photo_id FROM inspection_photos WHERE inspection_id = $1', [first.body.id])
    expect(links.rows.map(r => r.photo_id)).toEqual([photo.id])
    const findings = await db.query('SELECT count(*)::int AS n FROM findings WHERE inspection_id = $1', [first.body.id])
    expect(findings.rows[0].n).toBeGreaterThan(3)
    const covering = await installer.get(`/api/coverings/${ids.own.covering}`)
    expect(covering.body.lastInspectionId).toBe(first.body.id)
  })

  it('names the measured field that is impossible', async () => {
    const r = await installer.post(`/api/coverings/${ids.own.covering}/inspections`, { measurements: { ...tensioned, loopPullOutMm: -5 } })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^measurements\.loopPullOutMm/)
  })

  it('will not link another covering\'s photo', async () => {
    const elsewhere = await uploadPhoto(installer, ids.clientTwo.covering, 'tension_device')
    const r = await installer.post(`/api/coverings/${ids.own.covering}/inspections`, { measurements: tensioned, photoIds: [elsewhere.id] })
    expect(r.status).toBe(400)
    expect(r.body.data.fields.photoIds).toBeTruthy()
  })
})

describe('sign-offs of one covering at the same moment', () => {
  it('are saved or refused as dated before one saved, raise one remedy per failing clause, and the latest visit stays the latest', async () => {
    const admin = await signIn(accounts.admin)
    const tag = Date.now().toString(36).toUpperCase()
    const unit = await admin.post('/api/units', { siteId: ids.own.site, ref: `RACE-${tag}` })
    const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: 'Bedroom', recessWidthMm: 900, recessHeightMm: 1200 })
    const covering = await admin.post('/api/coverings', { openingId: opening.body.id, ref: `RACE-${tag}-1`, productType: 'roller', control: 'chain_loop', widthMm: 880, dropMm: 1200 })
    expect(covering.status, JSON.stringify(covering.body)).toBe(201)
    // A bead-chain loop hanging free to 300 mm from the floor: it fails, so each sign-off would raise remedies.
    const hanging = { headHeightMm: 1500, lowestCordPointMm: 300, loopPullOutMm: 600, loopPerimeterMm: 1800, tensionDevice: false, innerCordStops: true, warningLabel: true, installerLabel: true }
    const times = [1, 2, 3, 4, 5, 6].map(m => new Date(Date.now() - m * 60_000).toISOString())
    const answers = await Promise.all(times.map((inspectedAt, i) => installer.post(`/api/coverings/${covering.body.id}/inspections`,
      { kind: 'fitting', measurements: hanging, inspectedAt, clientKey: `race-${tag}-${i}` })))
    // The newest visit is always saved; one dated before a visit already saved is refused, naming inspectedAt.
    expect(answers[0]!.status, JSON.stringify(answers[0]!.body)).toBe(201)
    for (const a of answers.slice(1)) {
      expect([201, 400]).toContain(a.status)
      if (a.status === 400) expect(a.body.message).toMatch(/^inspectedAt/)
    }
    expect(answers[0]!.body.verdict).toBe('non_compliant')
    const open = await db.query(`SELECT clause, count(*)::int AS n FROM fixes WHERE covering_id = $1 AND status = 'open' GROUP BY clause`, [covering.body.id])
    expect(open.rows.length).toBeGreaterThan(0)
    expect(open.rows.filter(r => r.n !== 1)).toEqual([])
    // The visit a minute ago is the latest, whichever request committed last.
    const latest = await db.query('SELECT last_inspection_id FROM coverings WHERE id = $1', [covering.body.id])
    expect(Number(latest.rows[0].last_inspection_id)).toBe(answers[0]!.body.id)
  })
})
