import { createHash } from 'node:crypto'
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { accounts, database, signIn } from '../support/api'
import { launch, newPage, phone, seriousViolations, signInThroughPage } from '../support/browser'

const s3 = new S3Client({
  endpoint: process.env.S3_ENDPOINT, region: process.env.S3_REGION ?? 'us-east-1', forcePathStyle: true,
  credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' },
})
const bucket = process.env.S3_BUCKET ?? 'tautline-photos'
const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex')

let browser: Browser
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

// Lengths are text boxes labelled "<name> (mm)"; the mm / in buttons beside them are a separate group.
const length = (page: Page, name: string) => page.getByRole('textbox', { name: new RegExp(`^${name}`) })
async function answer(page: Page, question: string, choice: 'Yes' | 'No') {
  await page.getByRole('group', { name: question, exact: true }).getByText(choice, { exact: true }).click()
}
const verdict = (page: Page) => page.locator('#verdict')
const clauseIn = (page: Page, id: string) => verdict(page).locator('article').filter({ has: page.getByText(id, { exact: true }) })

describe('recording a fitting on a phone', () => {
  it('an installer finds a chain-loop blind, sees the loop fail, fits a tension device, adds its photo and signs off', async () => {
    const db = await database()
    const { context, page } = await newPage(browser, phone)
    try {
      await signInThroughPage(page, accounts.installer)
      await page.getByRole('link', { name: 'Start a fitting' }).click()
      await page.waitForURL(/\/fit$/)
      await page.getByLabel('Search by address, site, unit or covering').fill('WAT-4-02')
      await page.getByRole('link', { name: /^WAT-4-02/ }).click()
      await page.waitForURL(/\/coverings\/\d+\/fitting$/)
      const coveringId = Number(new URL(page.url()).pathname.split('/')[2])
      await page.getByRole('heading', { level: 1, name: 'Fitting WAT-4-02' }).waitFor()

      // A loop that can be pulled out 310 mm with its lowest point 1000 mm up, and no device: au.loop-reach fails.
      await length(page, 'Top of the head rail').fill('2100')
      await length(page, 'Lowest point of any cord or chain').fill('1000')
      await length(page, 'Largest loop pulled out').fill('310')
      await answer(page, 'Tension device fitted', 'No')
      const failing = clauseIn(page, 'au.loop-reach')
      await failing.getByText('Fails').waitFor()
      expect(await failing.innerText()).toMatch(/Measured\s*310 mm/)
      expect(await failing.innerText()).toMatch(/Limit\s*220 mm/)
      expect(await failing.innerText()).toMatch(/Fix:\s*Fit a tension device fixed to the wall or frame/)
      expect(await failing.innerText()).toMatch(/Safety Standard 2014, s 6\(1\)\(a\)/)
      await verdict(page).getByText('Non-compliant').first().waitFor()

      // A reload keeps what was typed: the draft lives on the phone.
      await page.reload()
      await page.getByText('Draft saved on this phone').waitFor()
      expect(await length(page, 'Largest loop pulled out').inputValue()).toBe('310')
      expect(await length(page, 'Top of the head rail').inputValue()).toBe('2100')

      // Put it right: a tension device at 900 mm holding the loop taut, pull-tested and locked. Fitted after the
      // failing check, the device changes what can be pulled out: the old 310 mm is cleared and the form asks again.
      await answer(page, 'Tension device fitted', 'Yes')
      await page.getByText('Measure the loop again with the tension device in place').waitFor()
      expect(await length(page, 'Largest loop pulled out').inputValue()).toBe('')
      // A device above the loop's lowest point does not hold it taut (common practice): the form warns.
      await length(page, 'Tension device height').fill('1100')
      await page.getByText(/The device is 1100 mm up but the loop reaches down to 1000 mm/).waitFor()
      await length(page, 'Tension device height').fill('900')
      await length(page, 'Lowest point of any cord or chain').fill('900')
      expect(await page.getByText(/The device is \d+ mm up/).count()).toBe(0)
      await length(page, 'Largest loop pulled out').fill('20')
      await page.getByRole('textbox', { name: /^Pull test: force held/ }).fill('80')
      await answer(page, 'Cord locked in', 'Yes')
      await page.getByLabel('Fixed into', { exact: true }).selectOption('masonry_plugs')
      for (const label of ['Warning label attached', 'Swing tag still on the cord', 'Your installer\'s label attached', 'Installed as the packaged instructions say']) await answer(page, label, 'Yes')
      await answer(page, 'Climbable furniture near the window', 'No')
      const loopClause = clauseIn(page, 'au.loop-reach')
      await loopClause.getByText('Meets').waitFor()
      expect(await loopClause.innerText()).toMatch(/20 mm/)
      await verdict(page).getByText('Compliant', { exact: true }).first().waitFor()

      // The tension device needs its photo before sign-off, and the page says so first.
      const signOff = page.getByRole('button', { name: 'Sign off this fitting' })
      expect(await signOff.isDisabled()).toBe(true)
      await page.getByText('Add a photo of the fitted tension device').waitFor()
      const png = await sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 40, g: 90, b: 70 } } }).png().toBuffer()
      await page.getByRole('group', { name: 'This photo shows' }).getByText('Tension device', { exact: true }).click()
      await page.getByLabel('Choose a file').setInputFiles({ name: 'tension-device.png', mimeType: 'image/png', buffer: png })
      await page.getByRole('list', { name: 'Photos of this visit' }).getByText('Stored').waitFor()
      expect(await signOff.isDisabled()).toBe(false)

      expect(await seriousViolations(page), 'fitting page').toEqual([])

      await signOff.click()
      await page.getByRole('heading', { name: 'Signed off and saved' }).waitFor()
      await page.getByRole('status').getByText('Compliant').first().waitFor()

      const { rows: [inspection] } = await db.query('SELECT id, kind, verdict, record, client_key FROM inspections WHERE covering_id = $1 ORDER BY id DESC LIMIT 1', [coveringId])
      expect(inspection).toMatchObject({ kind: 'fitting', verdict: 'compliant' })
      expect(inspection.record).toMatchObject({ headHeightMm: 2100, loopPullOutMm: 20, tensionDevice: true, tensionDeviceHeightMm: 900, tensionDeviceHoldN: 80, deviceFixing: 'masonry_plugs' })
      const { rows: photos } = await db.query(`SELECT p.kind, p.sha256, p.object_key FROM inspection_photos ip JOIN photos p ON p.id = ip.photo_id WHERE ip.inspection_id = $1`, [inspection.id])
      expect(photos).toHaveLength(1)
      expect(photos[0]).toMatchObject({ kind: 'tension_device', sha256: sha256(png) })
      const stored = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: photos[0].object_key }))
      expect(sha256(await stored.Body!.transformToByteArray())).toBe(photos[0].sha256)

      // Signed visits are final: the page offers a correction, and the draft is gone from the phone.
      await page.getByRole('button', { name: 'Record a correction' }).waitFor()
      const draftKeys = await page.evaluate(() => Object.keys(JSON.parse(localStorage.getItem('tautline.fittingDrafts') ?? '{}')))
      expect(draftKeys.filter(k => k.endsWith(`:${coveringId}`))).toEqual([])
    }
    finally {
      await context.close()
      await db.end()
    }
  })

  it('adds a unit, a room and a covering on the spot at Wattle Court and opens its fitting', async () => {
    const { context, page } = await newPage(browser, phone)
    const tag = Date.now().toString(36).toUpperCase()
    try {
      await signInThroughPage(page, accounts.installer)
      await page.goto('/fit')
      await page.getByRole('link', { name: /Wattle Court/ }).first().click()
      await page.waitForURL(/\/fit\/\d+$/)
      await page.getByRole('button', { name: 'Add a unit' }).click()
      await page.getByLabel('Unit reference').fill(`T${tag}`)
      await page.getByRole('button', { name: 'Add the unit' }).click()
      await page.waitForURL(/\?unit=\d+$/)
      await page.getByRole('button', { name: 'Add a room or opening' }).click()
      await page.getByLabel('Room', { exact: true }).fill('Nursery')
      await page.getByRole('group', { name: 'A child\'s bedroom or playroom' }).getByText('Yes').click()
      await page.getByRole('button', { name: 'Add the opening' }).click()
      await page.waitForURL(/&opening=\d+$/)
      await page.getByRole('button', { name: 'Add a covering' }).click()
      await page.getByLabel('Covering reference').fill(`WAT-T${tag}-01`)
      await page.getByRole('group', { name: 'Unit for Width' }).getByRole('button', { name: 'in', exact: true }).click()
      await page.getByRole('textbox', { name: /^Width/ }).fill('36')
      await page.getByText('= 914.4 mm').waitFor()
      await page.getByRole('textbox', { name: /^Drop/ }).fill('1400')
      await page.getByRole('button', { name: 'Add the covering' }).click()
      await page.waitForURL(/\/coverings\/\d+\/fitting$/)
      await page.getByRole('heading', { level: 1, name: `Fitting WAT-T${tag}-01` }).waitFor()
      await page.getByText('914 mm').first().waitFor()
    }
    finally {
      await context.close()
    }
  })

  it('signs off a control changed on site in one request: the covering changes with the visit, never before it', async () => {
    const db = await database()
    const admin = await signIn(accounts.admin)
    const tag = Date.now().toString(36).toUpperCase()
    const siteId = Number((await db.query(`SELECT id FROM sites WHERE ref = 'WAT'`)).rows[0].id)
    const unit = await admin.post('/api/units', { siteId, ref: `CTL-${tag}` })
    const opening = await admin.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: 'Living' })
    const covering = await admin.post('/api/coverings', { openingId: opening.body.id, ref: `CTL-${tag}-1`, productType: 'roller', control: 'chain_loop' })
    const { context, page } = await newPage(browser, phone)
    const writes: Array<{ method: string, url: string, body: string | null }> = []
    page.on('request', (r) => {
      if (r.url().includes('/api/coverings/') && r.method() !== 'GET') writes.push({ method: r.method(), url: r.url(), body: r.postData() })
    })
    try {
      await signInThroughPage(page, accounts.installer)
      await page.goto(`/coverings/${covering.body.id}/fitting`)
      await page.getByRole('heading', { level: 1, name: `Fitting CTL-${tag}-1` }).waitFor()
      await page.getByRole('group', { name: 'Control' }).getByText('Motorised', { exact: true }).click()
      await page.getByRole('button', { name: 'Sign off this fitting' }).click()
      await page.getByRole('heading', { name: 'Signed off and saved' }).waitFor()
      expect(writes.map(w => w.method)).toEqual(['POST'])
      expect(writes[0]!.url).toMatch(new RegExp(`/api/coverings/${covering.body.id}/inspections$`))
      expect(JSON.parse(writes[0]!.body!).covering).toEqual({ control: 'motorised' })
      const { rows: [row] } = await db.query('SELECT c.control, i.record->>\'control\' AS recorded FROM coverings c JOIN inspections i ON i.id = c.last_inspection_id WHERE c.id = $1', [covering.body.id])
      expect(row).toEqual({ control: 'motorised', recorded: 'motorised' })
    }
    finally {
      await context.close()
      await db.end()
    }
  })
})
