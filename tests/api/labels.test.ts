import { execFile } from 'node:child_process'
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { promisify } from 'node:util'
import jsQR from 'jsqr'
import { PNG } from 'pngjs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { LABEL_CAUTION, renderLabelsPdf } from '../../server/services/labels'
import type { LabelData } from '../../server/services/labels'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'

const run = promisify(execFile)
const appUrl = (process.env.APP_URL ?? baseUrl).replace(/\/+$/, '')
const dpi = 200
const pxPerMm = dpi / 25.4

// The sticker sheets as their makers publish them, so the test checks the labels land on the stickers.
const sheets = {
  'a4-14': { columns: 2, labelWidthMm: 99.1, labelHeightMm: 38.1, topMarginMm: 15.15, sideMarginMm: 4.65, columnGapMm: 2.5 },
  'letter-10': { columns: 2, labelWidthMm: 101.6, labelHeightMm: 50.8, topMarginMm: 12.7, sideMarginMm: 3.96875, columnGapMm: 4.7625 },
}

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let installer: ApiClient, officer: ApiClient, manager: ApiClient
let workDir: string

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  installer = await signIn(accounts.installer)
  officer = await signIn(accounts.officer)
  manager = await signIn(accounts.manager)
  workDir = await mkdtemp(join(tmpdir(), 'tautline-labels-'))
})
afterAll(async () => {
  await db.end()
  await rm(workDir, { recursive: true, force: true })
})

/** Fetches a PDF as bytes (the JSON client would mangle binary). */
async function getPdf(client: ApiClient, path: string) {
  const res = await fetch(baseUrl + path, { headers: { cookie: client.cookie ?? '' } })
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) }
}

let fileNo = 0
async function savePdf(bytes: Uint8Array) {
  const file = join(workDir, `labels-${++fileNo}.pdf`)
  await writeFile(file, bytes)
  return file
}

async function pdfText(file: string) {
  return (await run('pdftotext', ['-enc', 'UTF-8', file, '-'])).stdout
}
const squash = (text: string) => text.replace(/\s+/g, ' ')

/** Renders page 1 and decodes the QR code inside one sticker slot (1-based, row by row), or null if there is none. */
async function qrInSlot(file: string, sheet: keyof typeof sheets, slot: number, page = 1): Promise<string | null> {
  const prefix = join(workDir, `page-${++fileNo}`)
  await run('pdftoppm', ['-r', String(dpi), '-png', '-f', String(page), '-l', String(page), '-singlefile', file, prefix])
  const png = PNG.sync.read(await readFile(`${prefix}.png`))
  const s = sheets[sheet]
  const column = (slot - 1) % s.columns
  const row = Math.floor((slot - 1) / s.columns)
  const x0 = Math.round((s.sideMarginMm + column * (s.labelWidthMm + s.columnGapMm)) * pxPerMm)
  const y0 = Math.round((s.topMarginMm + row * s.labelHeightMm) * pxPerMm)
  const width = Math.round(s.labelWidthMm * pxPerMm)
  const height = Math.round(s.labelHeightMm * pxPerMm)
  const crop = new Uint8ClampedArray(width * height * 4)
  for (let y = 0; y < height; y++) {
    const from = ((y0 + y) * png.width + x0) * 4
    crop.set(png.data.subarray(from, from + width * 4), y * width * 4)
  }
  return jsQR(crop, width, height)?.data ?? null
}

async function fittedOnFromInspections(coveringId: number): Promise<string | null> {
  const r = await db.query(`SELECT to_char(max(inspected_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS day FROM inspections WHERE covering_id = $1 AND kind = 'fitting'`, [coveringId])
  return r.rows[0]?.day ?? null
}

describe('a covering\'s installer label', () => {
  it('names the business, the fitting date, the covering and its place, with the caution and nothing about certification', async () => {
    const r = await getPdf(installer, `/api/coverings/${ids.own.covering}/label.pdf?sheet=a4-14`)
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toBe('application/pdf')
    expect(r.headers.get('content-disposition')).toBe('inline; filename="tautline-labels-WAT-1-01.pdf"')
    const file = await savePdf(r.bytes)
    const text = squash(await pdfText(file))
    const fittedOn = await fittedOnFromInspections(ids.own.covering)
    expect(fittedOn, 'the demo records a fitting inspection for WAT-1-01').toMatch(/^\d{4}-\d{2}-\d{2}$/)
    expect(text).toContain('Tallowmere Blinds & Awnings')
    expect(text).toContain('+61 2 5550 0142')
    expect(text).toContain('fitters@tallowmere.example')
    expect(text).toContain('Licence DEMO-41877')
    expect(text).toMatch(new RegExp(`Fitted .*${fittedOn}`))
    expect(text).toContain('WAT-1-01')
    expect(text).toContain('Wattle Court · U1 · Living')
    expect(text).toContain(LABEL_CAUTION)
    expect(text).toMatch(/strangle/)
    expect(text).not.toMatch(/certif|complian|approved/i)
  })

  it('carries a QR code that opens the covering, on the first sticker of an A4 sheet', async () => {
    const r = await getPdf(installer, `/api/coverings/${ids.own.covering}/label.pdf?sheet=a4-14`)
    const file = await savePdf(r.bytes)
    expect(await qrInSlot(file, 'a4-14', 1)).toBe(`${appUrl}/coverings/${ids.own.covering}`)
    const info = (await run('pdfinfo', [file])).stdout
    expect(info).toMatch(/Pages:\s+1\n/)
    expect(info).toMatch(/Page size:\s+595\.\d+ x 841\.\d+ pts \(A4\)/)
    expect(info).toMatch(/Title:\s+Installer label WAT-1-01/)
    expect(info).toMatch(/Author:\s+Tautline/)
    expect(info).toMatch(/Creator:\s+Tautline/)
  })

  it('embeds Public Sans, regular and bold', async () => {
    const r = await getPdf(installer, `/api/coverings/${ids.own.covering}/label.pdf`)
    const fonts = (await run('pdffonts', [await savePdf(r.bytes)])).stdout
    const rows = fonts.split('\n').slice(2).filter(Boolean)
    expect(rows.some(l => /^PublicSans-Regular\S*\s.*\byes\b/.test(l)), fonts).toBe(true)
    expect(rows.some(l => /^PublicSans-Bold\S*\s.*\byes\b/.test(l)), fonts).toBe(true)
    // Every font on the page is embedded (the emb column is the first yes/no).
    for (const row of rows) expect(row.match(/\b(yes|no)\b/)?.[1], row).toBe('yes')
  })

  it('prints at a chosen position so a part-used sheet can go through again', async () => {
    const r = await getPdf(installer, `/api/coverings/${ids.own.covering}/label.pdf?sheet=a4-14&position=4`)
    expect(r.status).toBe(200)
    const file = await savePdf(r.bytes)
    expect(await qrInSlot(file, 'a4-14', 4)).toBe(`${appUrl}/coverings/${ids.own.covering}`)
    expect(await qrInSlot(file, 'a4-14', 1)).toBeNull()
  })

  it('picks a Letter sheet when asked, and refuses a position past its last slot', async () => {
    const r = await getPdf(officer, `/api/coverings/${ids.own.covering}/label.pdf?sheet=letter-10&position=10`)
    expect(r.status).toBe(200)
    const file = await savePdf(r.bytes)
    expect((await run('pdfinfo', [file])).stdout).toMatch(/Page size:\s+612 x 792 pts \(letter\)/)
    expect(await qrInSlot(file, 'letter-10', 10)).toBe(`${appUrl}/coverings/${ids.own.covering}`)
    const past = await installer.get(`/api/coverings/${ids.own.covering}/label.pdf?sheet=letter-10&position=11`)
    expect(past.status).toBe(400)
    expect(past.body.message).toMatch(/^position/)
    expect(past.body.data.fields.position).toBeTruthy()
  })

  it('rejects an unknown sheet with the parameter named', async () => {
    const r = await installer.get(`/api/coverings/${ids.own.covering}/label.pdf?sheet=a5-99`)
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^sheet/)
    expect(r.body.data.fields.sheet).toBeTruthy()
    const site = await installer.get(`/api/sites/${ids.own.site}/labels.pdf?sheet=`)
    expect(site.status).toBe(400)
    expect(site.body.message).toMatch(/^sheet/)
  })

  it('is for the fitting staff: a property manager gets 403', async () => {
    expect((await getPdf(manager, `/api/coverings/${ids.own.covering}/label.pdf`)).status).toBe(403)
    expect((await getPdf(manager, `/api/sites/${ids.own.site}/labels.pdf`)).status).toBe(403)
  })

  it('answers 404 for another workspace\'s covering or site', async () => {
    const covering = await getPdf(installer, `/api/coverings/${ids.other.covering}/label.pdf`)
    expect(covering.status).toBe(404)
    expect(covering.headers.get('content-type')).not.toBe('application/pdf')
    expect((await getPdf(installer, `/api/sites/${ids.other.site}/labels.pdf`)).status).toBe(404)
  })
})

describe('a site\'s installer labels', () => {
  it('labels every covering in place, in unit and opening order, dating each from its fitting or else its install', async () => {
    const inPlace = await db.query(`SELECT c.id, c.ref FROM coverings c JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id
      WHERE c.site_id = $1 AND c.status = 'in_place' ORDER BY u.ref, o.ref, c.ref`, [ids.own.site])
    expect(inPlace.rows.length).toBeGreaterThan(1)
    const r = await getPdf(installer, `/api/sites/${ids.own.site}/labels.pdf?sheet=a4-14`)
    expect(r.status).toBe(200)
    expect(r.headers.get('content-disposition')).toBe('inline; filename="tautline-labels-WAT.pdf"')
    const file = await savePdf(r.bytes)
    const text = squash(await pdfText(file))
    for (const row of inPlace.rows) expect(text).toContain(row.ref)
    expect(text.split('Tallowmere Blinds & Awnings').length - 1).toBe(inPlace.rows.length)
    expect(text.split(LABEL_CAUTION).length - 1).toBe(inPlace.rows.length)

    // WAT-4-02 has no fitting inspection in the demo, so its label carries its install date.
    const unfitted = await db.query(`SELECT c.id, to_char(c.installed_on, 'YYYY-MM-DD') AS day FROM coverings c WHERE c.ref = 'WAT-4-02'`)
    expect(await fittedOnFromInspections(unfitted.rows[0].id)).toBeNull()
    expect(text).toContain(unfitted.rows[0].day)
    expect(text).toContain((await fittedOnFromInspections(ids.own.covering))!)

    expect(await qrInSlot(file, 'a4-14', 1)).toBe(`${appUrl}/coverings/${inPlace.rows[0].id}`)
    expect(await qrInSlot(file, 'a4-14', 2)).toBe(`${appUrl}/coverings/${inPlace.rows[1].id}`)
  })

  it('flows onto a second page when the labels outrun the sheet', async () => {
    const count = Number((await db.query(`SELECT count(*) FROM coverings WHERE site_id = $1 AND status = 'in_place'`, [ids.own.site])).rows[0].count)
    expect(count, 'WAT has enough coverings to spill over a Letter sheet').toBeGreaterThanOrEqual(2)
    // Start where exactly one label lands on the last page (other test files add coverings to WAT, so count varies).
    const position = (((1 - count) % 10) + 10) % 10 + 1
    const pages = (position - 1 + count - 1) / 10 + 1
    expect(pages).toBeGreaterThanOrEqual(2)
    const r = await getPdf(installer, `/api/sites/${ids.own.site}/labels.pdf?sheet=letter-10&position=${position}`)
    expect(r.status).toBe(200)
    const file = await savePdf(r.bytes)
    expect((await run('pdfinfo', [file])).stdout).toMatch(new RegExp(`Pages:\\s+${pages}\\n`))
    expect(await qrInSlot(file, 'letter-10', 1, pages)).toMatch(new RegExp(`^${appUrl}/coverings/\\d+$`))
    expect(await qrInSlot(file, 'letter-10', 2, pages)).toBeNull()
  })
})

describe('label layout', () => {
  it('keeps over-long text inside each sticker, shrinking or cutting it with an ellipsis', async () => {
    const long = 'Extraordinarily Long Business Name for Window Furnishings and Awning Installations Pty Ltd'
    const label: LabelData = {
      coveringId: 987654, coveringRef: 'REF-WITH-A-VERY-LONG-NAME-THAT-KEEPS-GOING-AND-GOING-0123456789',
      siteName: 'The Grand Riverside Retirement Village and Community Centre, East Wing', unitRef: 'Apartment 1204B',
      room: 'Second bedroom, north-facing, overlooking the courtyard garden', fittedOn: '2026-01-31',
      business: { name: long, phone: '+61 2 5550 0199 extension 123456', email: 'installations.department@a-very-long-domain-name.example', licenceNumber: 'LIC-0000-1111-2222-3333' },
      url: 'https://tautline.example/coverings/987654',
    }
    for (const sheet of ['a4-14', 'letter-10'] as const) {
      const file = await savePdf(await renderLabelsPdf([label, label, label], { sheet, startPosition: 2 }))
      const html = (await run('pdftotext', ['-bbox', '-enc', 'UTF-8', file, '-'])).stdout
      const words = [...html.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)]
        .map(m => ({ xMin: Number(m[1]), yMin: Number(m[2]), xMax: Number(m[3]), yMax: Number(m[4]), text: m[5]! }))
      expect(words.length).toBeGreaterThan(30)
      expect(html).toContain('…')
      const s = sheets[sheet]
      const ptPerMm = 72 / 25.4
      const slots = [2, 3, 4].map((slot) => {
        const column = (slot - 1) % s.columns
        const row = Math.floor((slot - 1) / s.columns)
        const x = (s.sideMarginMm + column * (s.labelWidthMm + s.columnGapMm)) * ptPerMm
        const y = (s.topMarginMm + row * s.labelHeightMm) * ptPerMm
        return { x0: x, y0: y, x1: x + s.labelWidthMm * ptPerMm, y1: y + s.labelHeightMm * ptPerMm }
      })
      for (const w of words) {
        // Each word must sit wholly inside one sticker, with a millimetre to spare for die-cut tolerance.
        const inside = slots.some(b => w.xMin >= b.x0 + ptPerMm && w.xMax <= b.x1 - ptPerMm && w.yMin >= b.y0 + ptPerMm && w.yMax <= b.y1 - ptPerMm)
        expect(inside, `${sheet}: "${w.text}" at ${w.xMin},${w.yMin}–${w.xMax},${w.yMax}`).toBe(true)
      }
      expect(squash(await pdfText(file))).toContain(LABEL_CAUTION)
    }
  })
})
