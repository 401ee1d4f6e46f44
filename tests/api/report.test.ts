import { execFile } from 'node:child_process'
import { createHash } from 'node:crypto'
import { mkdtemp, rm, writeFile } from 'node:fs/promises'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3'
import nodemailer from 'nodemailer'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import type { Sequelize } from 'sequelize'
import { createSequelize } from '../../server/db'
import { REPORT_CAUTION, renderSiteReport, verdictOrder, verdictWords } from '../../server/services/report'
import type { ReportCovering, SiteReportData } from '../../server/services/report'
import { MAX_ATTEMPTS, RETRY_BASE_MS, emailSiteReport, retryQueuedReportMails } from '../../server/services/report-dispatch'
import { ruleSets } from '../../rules'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { messagesTo, waitForMail } from '../support/mail'
import type { StoredMail } from '../support/mail'
import { uploadPhoto } from '../support/photos'

const run = promisify(execFile)
const s3 = new S3Client({
  endpoint: process.env.S3_ENDPOINT, region: process.env.S3_REGION ?? 'us-east-1', forcePathStyle: true,
  credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' },
})
const bucket = process.env.S3_BUCKET ?? 'tautline-photos'
const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex')
const squash = (text: string) => text.replace(/\s+/g, ' ')
const clauseTitles = new Map(Object.values(ruleSets).flatMap(s => s.clauses.map(c => [c.id, c.title] as const)))

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let officer: ApiClient, admin: ApiClient, installer: ApiClient, manager: ApiClient, manager2: ApiClient, otherAdmin: ApiClient
let workDir: string
let photoId: number
let failingCovering: number

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  officer = await signIn(accounts.officer)
  admin = await signIn(accounts.admin)
  installer = await signIn(accounts.installer)
  manager = await signIn(accounts.manager)
  manager2 = await signIn(accounts.manager2)
  otherAdmin = await signIn(accounts.otherAdmin)
  workDir = await mkdtemp(join(tmpdir(), 'tautline-report-'))
  // The demo has no photos: give a non-compliant covering one, so its thumbnail is drawn.
  failingCovering = (await db.query(`SELECT id FROM coverings WHERE ref = 'WAT-1-02'`)).rows[0].id
  const jpeg = await sharp({ create: { width: 1200, height: 900, channels: 3, background: '#8c6f4e' } }).jpeg().toBuffer()
  photoId = (await uploadPhoto(installer, failingCovering, 'whole', jpeg, 'loose-chain.jpg')).id
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
  const file = join(workDir, `report-${++fileNo}.pdf`)
  await writeFile(file, bytes)
  return file
}
const pdfText = async (file: string, ...args: string[]) => (await run('pdftotext', ['-enc', 'UTF-8', ...args, file, '-'])).stdout
const today = () => new Date().toISOString().slice(0, 10)

/** The decoded bytes of each attachment of a stored message, with its content type. */
function attachments(mail: StoredMail): Array<{ contentType: string, fileName: string | null, bytes: Buffer }> {
  const unfolded = mail.raw.replace(/\r?\n[ \t]+/g, ' ')
  const boundary = unfolded.match(/^Content-Type:\s*multipart\/mixed;.*boundary="?([^";\r\n]+)"?/im)?.[1]
  if (!boundary) return []
  return mail.raw.split(`--${boundary}`).slice(1).flatMap((part) => {
    const [head = '', ...rest] = part.split(/\r?\n\r?\n/)
    const headers = head.replace(/\r?\n[ \t]+/g, ' ')
    const contentType = headers.match(/^Content-Type:\s*([^;\r\n]+)/im)?.[1]?.trim()
    if (!contentType || !/^Content-Disposition:\s*attachment/im.test(headers)) return []
    const fileName = headers.match(/filename="?([^";\r\n]+)"?/i)?.[1] ?? null
    const encoded = rest.join('\n\n')
    const bytes = /^Content-Transfer-Encoding:\s*base64/im.test(headers) ? Buffer.from(encoded.replace(/\s+/g, ''), 'base64') : Buffer.from(encoded)
    return [{ contentType, fileName, bytes }]
  })
}

async function failedFindings(siteId: number) {
  const r = await db.query(`SELECT c.ref, f.clause, f.source, f.measured, f.limit_value, f.unit FROM coverings c
    JOIN findings f ON f.inspection_id = c.last_inspection_id
    WHERE c.site_id = $1 AND c.status = 'in_place' AND c.last_verdict = 'non_compliant' AND f.verdict = 'fail'`, [siteId])
  return r.rows as Array<{ ref: string, clause: string, source: string, measured: string, limit_value: string, unit: string | null }>
}

describe('the landlord\'s site report', () => {
  it('names the client and site and shows each failed clause with its source, the measured value against the limit, and the caution', async () => {
    const r = await getPdf(officer, `/api/sites/${ids.own.site}/report.pdf`)
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toBe('application/pdf')
    expect(r.headers.get('content-disposition')).toBe(`inline; filename="tautline-report-WAT-${today()}.pdf"`)
    const file = await savePdf(r.bytes)
    const text = squash(await pdfText(file))
    expect(text).toContain('Wattle Court')
    expect(text).toContain('Brindlewood Lettings')
    expect(text).toContain('Tallowmere Blinds & Awnings')
    expect(text).toContain(ruleSets.AU.version)

    const fails = await failedFindings(ids.own.site)
    expect(fails.length, 'the demo has failed clauses at WAT').toBeGreaterThan(2)
    for (const f of fails) {
      expect(text).toContain(f.ref)
      expect(text).toContain(clauseTitles.get(f.clause) ?? f.clause)
      expect(text).toContain(f.clause)
      expect(text).toContain(`Source: ${squash(f.source)}`)
      if (f.unit === 'mm') expect(text).toContain(`Measured: ${f.measured} mm`)
    }
    expect(text).toMatch(/Measured: 310 mm (au\.loop-reach )?Limit: 220 mm/)
    expect(text).toContain('Basis: Published text of the requirement')
    expect(text).toContain('Remedy:')

    expect(text).toContain(REPORT_CAUTION)
    expect(text).toMatch(/strangle young children/)
    // The caution disclaims certification; nothing else in the report may claim it.
    const rest = text.split(REPORT_CAUTION).join(' ').replace(/it does not certify/g, '')
    expect(rest).not.toMatch(/certif/i)

    // Counts by verdict, in the product's words, agree with the register.
    const counts = (await db.query(`SELECT coalesce(last_verdict, 'not_checked') AS v, count(*)::int AS n FROM coverings
      WHERE site_id = $1 AND status = 'in_place' GROUP BY 1`, [ids.own.site])).rows as Array<{ v: keyof typeof verdictWords, n: number }>
    const byVerdict = new Map(counts.map(({ v, n }) => [v, n]))
    const tiles = verdictOrder.map(v => byVerdict.get(v) ?? 0)
    const layout = await pdfText(file, '-layout', '-f', '1', '-l', '1')
    expect(layout).toMatch(new RegExp(`${tiles.join('\\s+')}\\s*\\n\\s*${verdictOrder.map(v => verdictWords[v]).join('\\s+')}`))
    expect(byVerdict.get('not_checked'), 'WAT-4-02 has never been inspected').toBe(1)

    const info = (await run('pdfinfo', [file])).stdout
    const pages = Number(info.match(/Pages:\s+(\d+)/)![1])
    expect(pages).toBeGreaterThanOrEqual(3)
    expect(info).toMatch(/Page size:\s+595\.\d+ x 841\.\d+ pts \(A4\)/)
    expect(text).toContain(`Page 1 of ${pages}`)
    expect(text).toContain(`Page ${pages} of ${pages}`)
    expect(text).toMatch(/Signature/)
  })

  it('draws the stored thumbnail of a non-compliant covering\'s photo', async () => {
    const r = await getPdf(officer, `/api/sites/${ids.own.site}/report.pdf`)
    const file = await savePdf(r.bytes)
    const images = (await run('pdfimages', ['-list', file])).stdout.split('\n').slice(2).filter(Boolean)
    expect(images.length).toBeGreaterThanOrEqual(1)
    // The thumbnail is embedded as stored: a JPEG no wider than 480 px.
    const [, , , width, height, , , , filter] = images[0]!.trim().split(/\s+/)
    expect(Math.max(Number(width), Number(height))).toBeLessThanOrEqual(480)
    expect(filter).toBe('jpeg')
    expect(squash(await pdfText(file))).toContain(`photo #${photoId}`)
  })

  it('embeds Public Sans, regular and bold, and nothing else', async () => {
    const r = await getPdf(admin, `/api/sites/${ids.own.site}/report.pdf`)
    const fonts = (await run('pdffonts', [await savePdf(r.bytes)])).stdout
    const rows = fonts.split('\n').slice(2).filter(Boolean)
    expect(rows.some(l => /^PublicSans-Regular\S*\s.*\byes\b/.test(l)), fonts).toBe(true)
    expect(rows.some(l => /^PublicSans-Bold\S*\s.*\byes\b/.test(l)), fonts).toBe(true)
    for (const row of rows) expect(row.match(/\b(yes|no)\b/)?.[1], row).toBe('yes')
  })

  it('is for a property manager only on their own client\'s sites, and never another workspace\'s', async () => {
    expect((await getPdf(manager, `/api/sites/${ids.own.site}/report.pdf`)).status).toBe(200)
    expect((await getPdf(manager, `/api/sites/${ids.clientTwo.site}/report.pdf`)).status).toBe(404)
    const other = await getPdf(officer, `/api/sites/${ids.other.site}/report.pdf`)
    expect(other.status).toBe(404)
    expect(other.headers.get('content-type')).not.toBe('application/pdf')
    expect((await getPdf(otherAdmin, `/api/sites/${ids.own.site}/report.pdf`)).status).toBe(404)
    expect((await getPdf(installer, `/api/sites/${ids.own.site}/report.pdf`)).status).toBe(403)
  })

  it('prints on Letter paper for a Canadian site', async () => {
    const ntb = (await db.query(`SELECT id FROM sites WHERE ref = 'NTB'`)).rows[0].id
    const r = await getPdf(manager2, `/api/sites/${ntb}/report.pdf`)
    expect(r.status).toBe(200)
    const file = await savePdf(r.bytes)
    expect((await run('pdfinfo', [file])).stdout).toMatch(/Page size:\s+612 x 792 pts \(letter\)/)
    const text = squash(await pdfText(file))
    expect(text).toContain('Northbank Terrace')
    expect(text).toContain('Corded Window Coverings Regulations, SOR/2019-97')
  })
})

describe('e-mailing the report', () => {
  it('sends the PDF to the client\'s report contact, keeps the file in S3 and lists who sent what to whom', async () => {
    const to = 'reports@brindlewood.example'
    const before = messagesTo(to).length
    const r = await officer.post(`/api/sites/${ids.own.site}/report/email`, {})
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.dispatch).toMatchObject({ to, status: 'sent', attempts: 1, sentBy: { name: 'Dev Okonjo' } })
    expect(r.body.dispatch.fileName).toBe(`tautline-report-WAT-${today()}.pdf`)

    const mail = await waitForMail(to, before)
    expect(mail.subject).toContain('Wattle Court (WAT)')
    expect(squash(mail.text)).toContain('does not certify')
    const [pdf] = attachments(mail)
    expect(pdf?.contentType).toBe('application/pdf')
    expect(pdf?.fileName).toBe(r.body.dispatch.fileName)
    expect(pdf!.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')

    const { rows: [row] } = await db.query('SELECT * FROM report_dispatches WHERE id = $1', [r.body.dispatch.id])
    expect(row.object_key).toMatch(new RegExp(`^w\\d+/s${ids.own.site}/reports/[0-9a-f-]{36}\\.pdf$`))
    expect(row).toMatchObject({ status: 'sent', attempts: 1, sent_to: to, last_error: null })
    expect(row.sent_at).not.toBeNull()
    // The file in S3 is the very file that was mailed.
    const stored = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: row.object_key }))
    const storedBytes = await stored.Body!.transformToByteArray()
    expect(sha256(storedBytes)).toBe(row.sha256)
    expect(sha256(pdf!.bytes)).toBe(row.sha256)
    expect(row.size_bytes).toBe(storedBytes.byteLength)

    for (const client of [officer, manager]) {
      const list = await client.get(`/api/sites/${ids.own.site}/reports`)
      expect(list.status).toBe(200)
      const item = list.body.items.find((d: { id: number }) => d.id === r.body.dispatch.id)
      expect(item).toMatchObject({ to, subject: mail.subject, status: 'sent', attempts: 1, sentBy: { name: 'Dev Okonjo' } })
      expect(item.createdAt).toBeTruthy()
      expect(item.sentAt).toBeTruthy()
    }
    expect((await manager2.get(`/api/sites/${ids.own.site}/reports`)).status).toBe(404)
    expect((await otherAdmin.get(`/api/sites/${ids.own.site}/reports`)).status).toBe(404)
  })

  it('sends to another address when asked, and refuses one that is not an address', async () => {
    const to = 'landlord.office@example.com'
    const before = messagesTo(to).length
    const r = await admin.post(`/api/sites/${ids.own.site}/report/email`, { to: ' Landlord.Office@example.com ' })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body.dispatch.to).toBe(to)
    expect(attachments(await waitForMail(to, before))[0]?.contentType).toBe('application/pdf')

    const bad = await officer.post(`/api/sites/${ids.own.site}/report/email`, { to: 'not an address' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^to/)
    expect(bad.body.data.fields.to).toBeTruthy()
  })

  it('is for the office: a property manager gets 403, another workspace 404', async () => {
    expect((await manager.post(`/api/sites/${ids.own.site}/report/email`, {})).status).toBe(403)
    expect((await installer.post(`/api/sites/${ids.own.site}/report/email`, {})).status).toBe(403)
    expect((await officer.post(`/api/sites/${ids.other.site}/report/email`, {})).status).toBe(404)
  })
})

describe('a report the mail server refuses', () => {
  let seq: Sequelize
  let seq2: Sequelize
  let deadMailer: nodemailer.Transporter
  let liveMailer: nodemailer.Transporter
  let officerId: number
  const send = (t: nodemailer.Transporter) => (m: nodemailer.SendMailOptions) => t.sendMail({ from: 'Tautline <no-reply@tautline.test>', ...m })

  beforeAll(async () => {
    seq = createSequelize(undefined, { poolMax: 3 })
    seq2 = createSequelize(undefined, { poolMax: 3 })
    // A port with nothing listening: the send really fails, as it would with the relay down.
    const probe = createServer()
    const port = await new Promise<number>(resolve => probe.listen(0, '127.0.0.1', () => resolve((probe.address() as { port: number }).port)))
    await new Promise(resolve => probe.close(resolve))
    deadMailer = nodemailer.createTransport({ host: '127.0.0.1', port, connectionTimeout: 2000 })
    liveMailer = nodemailer.createTransport(process.env.SMTP_URL!)
    officerId = (await db.query('SELECT id FROM users WHERE email = $1', [accounts.officer])).rows[0].id
  })
  afterAll(async () => {
    await seq?.close()
    await seq2?.close()
  })

  const rowOf = async (id: number) => (await db.query('SELECT * FROM report_dispatches WHERE id = $1', [id])).rows[0]

  it('stays queued with the error and its attempts, then goes out from the stored PDF on a later round', async () => {
    const to = 'queued-report@example.com'
    const { outcome, dispatch } = await emailSiteReport(seq, { actor: { id: officerId }, siteId: ids.own.site, to, send: send(deadMailer) })
    expect(outcome).toBe('queued')
    const queued = await rowOf(dispatch.id)
    expect(queued).toMatchObject({ status: 'queued', attempts: 1 })
    expect(queued.last_error).toMatch(/ECONNREFUSED/)
    expect(new Date(queued.next_attempt_at).getTime() - Date.now()).toBeGreaterThan(RETRY_BASE_MS - 5_000)
    expect(messagesTo(to)).toHaveLength(0)

    const later = new Date(new Date(queued.next_attempt_at).getTime() + 1000)
    const tally = await retryQueuedReportMails(seq, { now: later, send: send(liveMailer) })
    expect(tally.sent).toBeGreaterThanOrEqual(1)
    const sent = await rowOf(dispatch.id)
    expect(sent).toMatchObject({ status: 'sent', attempts: 2, last_error: null })
    const mail = await waitForMail(to, 0)
    const [pdf] = attachments(mail)
    expect(pdf?.contentType).toBe('application/pdf')
    expect(sha256(pdf!.bytes)).toBe(sent.sha256)

    const list = await officer.get(`/api/sites/${ids.own.site}/reports?pageSize=100`)
    expect(list.body.items.find((d: { id: number }) => d.id === dispatch.id)).toMatchObject({ to, status: 'sent', attempts: 2 })
  })

  it('backs off, doubling the wait, and gives up as failed after the last attempt', async () => {
    const { dispatch } = await emailSiteReport(seq, { actor: { id: officerId }, siteId: ids.own.site, to: 'never-delivered@example.com', send: send(deadMailer) })
    const waits: number[] = []
    for (let attempt = 2; attempt <= MAX_ATTEMPTS; attempt++) {
      const row = await rowOf(dispatch.id)
      expect(row.status).toBe('queued')
      const now = new Date(new Date(row.next_attempt_at).getTime() + 1000)
      await retryQueuedReportMails(seq, { now, send: send(deadMailer) })
      const after = await rowOf(dispatch.id)
      expect(after.attempts).toBe(attempt)
      if (after.status === 'queued') waits.push(new Date(after.next_attempt_at).getTime() - now.getTime())
    }
    expect(waits).toEqual(waits.map((_, i) => RETRY_BASE_MS * 2 ** (i + 1)))
    const given = await rowOf(dispatch.id)
    expect(given).toMatchObject({ status: 'failed', attempts: MAX_ATTEMPTS })
    expect(given.last_error).toMatch(/ECONNREFUSED/)
    const list = await officer.get(`/api/sites/${ids.own.site}/reports?pageSize=100`)
    expect(list.body.items.find((d: { id: number }) => d.id === dispatch.id)).toMatchObject({ status: 'failed', attempts: MAX_ATTEMPTS })
  })

  it('is shared between workers without sending any report twice', async () => {
    const to = 'shared-retry@example.com'
    const made = []
    for (let i = 0; i < 4; i++) made.push((await emailSiteReport(seq, { actor: { id: officerId }, siteId: ids.own.site, to, send: send(deadMailer) })).dispatch.id)
    const due = new Date(Date.now() + RETRY_BASE_MS + 60_000)
    // Two workers on two connection pools, as two server processes would run them.
    const [a, b] = await Promise.all([
      retryQueuedReportMails(seq, { now: due, send: send(liveMailer), batch: 2 }),
      retryQueuedReportMails(seq2, { now: due, send: send(liveMailer), batch: 2 }),
    ])
    expect(a.claimed + b.claimed).toBeGreaterThanOrEqual(made.length)
    await retryQueuedReportMails(seq, { now: due, send: send(liveMailer) })
    for (const id of made) expect(await rowOf(id)).toMatchObject({ status: 'sent', attempts: 2 })
    await new Promise(r => setTimeout(r, 300))
    expect(messagesTo(to)).toHaveLength(made.length)
  })
})

describe('report layout', () => {
  const covering = (i: number): ReportCovering => ({
    id: 10_000 + i, ref: `LONG-${String(i).padStart(3, '0')}`, openingRef: `W${i}`,
    room: `Garden room LONG-${String(i).padStart(3, '0')} end-${i}`,
    childrensRoom: i % 5 === 0, productType: 'roller', control: 'chain_loop', widthMm: 1200, dropMm: 1500,
    verdict: i % 3 === 0 ? 'non_compliant' : 'compliant', inspectedOn: '2026-11-02', inspectionKind: 'fitting',
  })
  const data = (n: number): SiteReportData => ({
    generatedOn: '2026-12-01',
    business: { name: 'Layout Test Fitters', phone: null, email: null, address: null, licenceNumber: null },
    client: { name: 'Layout Client', contactName: null, reportEmail: 'layout@example.com' },
    site: { id: 1, workspaceId: 1, ref: 'LAY', name: 'Layout House', address: '1 Test Street', jurisdiction: 'AU', premises: 'rental_home' },
    ruleSets: [{ version: ruleSets.AU.version, name: ruleSets.AU.name, current: true, coverings: n }],
    summary: { compliant: n, non_compliant: 0, incomplete: 0, not_applicable: 0, not_checked: 0, total: n, openRemedies: 0, overdueRemedies: 0 },
    units: [{ ref: 'B1', name: 'Block 1', floor: null, coverings: Array.from({ length: n }, (_, i) => covering(i + 1)) }],
    failures: [],
    audit: null,
    removals: [],
    removalsSince: null,
    signOff: { officerName: 'Ada Officer', closedOn: '2026-11-30' },
  })

  it('breaks a long unit table between rows, repeating the unit and the header row on each page', async () => {
    const file = await savePdf(await renderSiteReport(data(90), new Map()))
    const pages = Number((await run('pdfinfo', [file])).stdout.match(/Pages:\s+(\d+)/)![1])
    const texts: string[] = []
    for (let p = 1; p <= pages; p++) texts.push(squash(await pdfText(file, '-f', String(p), '-l', String(p))))
    const tablePages = texts.map((t, i) => ({ t, i })).filter(({ t }) => t.includes('LONG-0'))
    expect(tablePages.length).toBeGreaterThan(2)
    tablePages.forEach(({ t }, n) => {
      expect(t).toContain('Last inspection')
      expect(t).toContain('Size W × D mm')
      if (n > 0) expect(t).toContain('B1 · Block 1 (continued)')
    })
    for (let i = 1; i <= 90; i++) {
      const ref = `LONG-${String(i).padStart(3, '0')}`
      const holding = texts.filter(t => t.includes(`${ref} `))
      // A row is whole on one page: its first and last lines are together.
      expect(holding, ref).toHaveLength(1)
      expect(holding[0], ref).toContain(`end-${i}`)
    }
    const last = texts[pages - 1]!
    expect(last).toContain('Ada Officer')
    expect(last).toContain('30 November 2026')
    expect(last).toContain(`Page ${pages} of ${pages}`)
  })
})
