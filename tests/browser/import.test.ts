import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { accounts } from '../support/api'
import { launch, laptop, newPage, phone, seriousViolations, signInThroughPage } from '../support/browser'
import { csvOf } from '../support/jobs'

let browser: Browser
beforeAll(async () => { browser = await launch() })
afterAll(async () => { await browser?.close() })

const header = ['site_ref', 'site_name', 'address', 'jurisdiction', 'premises', 'unit_ref', 'unit_name', 'opening_ref', 'room', 'covering_ref', 'product_type', 'control',
  'made_to', 'installed_on', 'measured_on', 'head_height_mm', 'lowest_cord_point_mm', 'loop_pull_out_mm', 'tension_device', 'warning_label', 'swing_tag', 'installer_label', 'manufacturer_label', 'installed_per_instructions']
const measured = { product_type: 'roller', control: 'chain_loop', made_to: 'custom', installed_on: '2025-05-01', measured_on: '2026-06-02', head_height_mm: '2100mm',
  lowest_cord_point_mm: '900', loop_pull_out_mm: '150', tension_device: 'no', warning_label: 'yes', swing_tag: 'yes', installer_label: 'yes', manufacturer_label: 'yes', installed_per_instructions: 'yes' }
const site = { site_ref: 'BRW', site_name: 'Browser Mews', address: '12 Pane Street, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home' }

async function choose(page: Page, csv: string, name: string) {
  // A file chosen before the page has hydrated is lost to Vue; so, as a person would, choose it again if no check starts.
  await page.waitForLoadState('networkidle')
  for (let attempt = 1; ; attempt++) {
    await page.getByLabel('CSV file').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(csv) })
    await page.getByRole('button', { name: 'Check the file' }).click()
    try {
      await page.getByRole('heading', { name: new RegExp(`: ${name.replace(/\./g, '\\.')}$`) }).waitFor({ timeout: 10_000 })
      return
    }
    catch (err) {
      if (attempt >= 3) throw err
    }
  }
}

/** Waits for the named progress bar to reach 100 and its job to finish. */
async function finished(page: Page, bar: string) {
  const progress = page.getByRole('progressbar', { name: bar })
  await progress.waitFor()
  await page.waitForFunction(name => [...document.querySelectorAll('[role=progressbar]')]
    .some(el => el.getAttribute('aria-label') === name && el.getAttribute('aria-valuenow') === '100'), bar, { timeout: 60_000 })
  await page.getByText(new RegExp(`${bar}: Finished`)).waitFor({ timeout: 10_000 })
}

describe('importing units through the page', () => {
  it('a manager checks a file, imports it, watches the progress finish, and sees the units', async () => {
    const { context, page } = await newPage(browser, laptop)
    try {
      await signInThroughPage(page, accounts.manager)
      await page.goto('/imports')
      await page.getByRole('heading', { level: 1, name: 'Imports' }).waitFor()
      expect(await page.getByRole('link', { name: /Download the template/ }).getAttribute('href')).toBe('/api/imports/template.csv')
      expect(await seriousViolations(page), 'imports page').toEqual([])

      await choose(page, csvOf(header, [
        { ...site, unit_ref: 'G1', unit_name: 'Garden flat', opening_ref: 'W1', room: 'Living', covering_ref: 'BRW-G1-01', ...measured },
        { site_ref: 'BRW', unit_ref: 'G2', unit_name: 'Mews flat', opening_ref: 'W1', room: 'Bedroom', covering_ref: 'BRW-G2-01', ...measured, loop_pull_out_mm: '400', lowest_cord_point_mm: '500' },
        { site_ref: 'BRW', unit_ref: 'G3', unit_name: 'Loft' },
      ]), 'browser-mews.csv')
      await finished(page, 'Checking the rows')
      await page.getByRole('heading', { name: 'All 3 rows are ready to import' }).waitFor()
      expect(await seriousViolations(page), 'dry-run report').toEqual([])

      await page.getByRole('button', { name: 'Import 3 rows' }).click()
      await finished(page, 'Importing the rows')
      await page.getByRole('heading', { name: 'Imported 3 rows' }).waitFor()

      await page.getByRole('link', { name: 'See the units in your portfolio' }).click()
      await page.waitForURL(url => url.pathname === '/')
      const units = page.getByRole('table', { name: /Units with their coverings/ })
      for (const ref of ['G1', 'G2', 'G3']) await units.getByRole('link', { name: ref, exact: true }).waitFor()
      await page.getByText('BRW-G2-01').first().waitFor()
      expect(await seriousViolations(page), 'portfolio').toEqual([])
    }
    finally {
      await context.close()
    }
  })

  it('lists a bad row by number and column, and imports the rest only when told to skip it', async () => {
    const { context, page } = await newPage(browser, phone)
    try {
      await signInThroughPage(page, accounts.manager)
      await page.goto('/imports')
      await choose(page, csvOf(header, [
        { ...site, unit_ref: 'G4', unit_name: 'Cellar flat' },
        { site_ref: 'BRW', unit_ref: 'G5', opening_ref: 'W1', room: 'Living', covering_ref: 'BRW-G5-01', ...measured, head_height_mm: 'tall' },
      ]), 'browser-mews-2.csv')
      await finished(page, 'Checking the rows')
      await page.getByRole('heading', { name: /2 rows checked: 1 row with problems/ }).waitFor()
      const problems = page.getByRole('table', { name: 'Rows with problems' })
      // The problem rows arrive after the heading: wait for the row itself before reading its cells.
      const firstProblem = problems.locator('tbody tr').first()
      await firstProblem.locator('td', { hasText: 'head_height_mm' }).waitFor()
      const cells = await firstProblem.locator('td').allInnerTexts()
      expect(cells[0]).toBe('3')
      expect(cells[1]).toBe('head_height_mm')
      expect(cells[2]).toMatch(/“tall” is not a number/)
      const importButton = page.getByRole('button', { name: 'Import 1 row' })
      expect(await importButton.isDisabled()).toBe(true)
      await page.getByLabel(/Skip the 1 row with problems/).check()
      await importButton.click()
      await finished(page, 'Importing the rows')
      await page.getByRole('heading', { name: /Imported 1 row, skipped 1 row with problems/ }).waitFor()
      expect(await seriousViolations(page), 'import on a phone').toEqual([])
    }
    finally {
      await context.close()
    }
  })
})
