import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import { waitForMail } from '../support/mail'
import { launch, laptop, newPage, phone, seriousViolations, signInThroughPage } from '../support/browser'

// The admin's Mailbox reads the workspace's own sent mail as a person reads it: the text, its links, and the
// report PDF as a download. MAILBOX_SHOTS=<folder> keeps a screenshot of each size for a look.
let browser: Browser
const invitee = `mailbox.reader.${Date.now()}@demo.tautline.test`

beforeAll(async () => {
  browser = await launch()
  const admin = await signIn(accounts.admin)
  const db = await database()
  const ids = await fixtureIds(db)
  await db.end()
  expect((await admin.post(`/api/sites/${ids.own.site}/report/email`, {})).status).toBeLessThan(300)
  expect((await admin.post('/api/users', { email: invitee, name: 'Mailbox Reader', role: 'installer' })).status).toBe(201)
  await waitForMail(invitee)
})
afterAll(async () => { await browser?.close() })

describe('the Mailbox', () => {
  for (const [name, device] of [['laptop', laptop], ['phone', phone]] as const) {
    it(`shows an invitation as its recipient reads it, with its link, on a ${name}`, async () => {
      const { context, page } = await newPage(browser, device)
      try {
        await signInThroughPage(page, accounts.admin)
        await page.goto('/mailbox')
        await page.getByRole('link', { name: new RegExp(`Mailbox Reader|${invitee.replace(/\./g, '\\.')}`) }).first().click()
        await page.getByRole('heading', { level: 2, name: /invited you to/ }).waitFor()
        expect(await page.getByText(/Choose your password here/).count()).toBeGreaterThan(0)
        await page.getByRole('link', { name: /\/welcome \(open here\)/ }).waitFor()
        expect(await seriousViolations(page), 'mailbox').toEqual([])
        // A long link or address wraps; the page never scrolls sideways.
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(device.viewport.width)
        if (process.env.MAILBOX_SHOTS) await page.screenshot({ path: `${process.env.MAILBOX_SHOTS}/mailbox-invite-${name}.png`, fullPage: true })
      }
      finally {
        await context.close()
      }
    })
  }

  it('offers the report\'s PDF as a download', async () => {
    const { context, page } = await newPage(browser, laptop)
    try {
      await signInThroughPage(page, accounts.admin)
      await page.goto('/mailbox')
      await page.getByRole('link', { name: /Cord-safety report: Wattle Court/ }).first().click()
      const pdfLink = page.getByRole('link', { name: /\.pdf$/ })
      await pdfLink.waitFor()
      const download = page.waitForEvent('download')
      await pdfLink.click()
      expect((await download).suggestedFilename()).toMatch(/\.pdf$/)
      if (process.env.MAILBOX_SHOTS) await page.screenshot({ path: `${process.env.MAILBOX_SHOTS}/mailbox-report-laptop.png`, fullPage: true })
    }
    finally {
      await context.close()
    }
  })
})
