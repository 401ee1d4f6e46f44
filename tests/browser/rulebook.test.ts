import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { accounts } from '../support/api'
import { launch, laptop, newPage, phone, seriousViolations, signInThroughPage } from '../support/browser'

let browser: Browser
// A clause's card, found by its id (notes of other clauses may mention the id too).
const clause = (page: Page, id: string) => page.locator('article').filter({ has: page.getByText(id, { exact: true }) })
beforeAll(async () => {
  browser = await launch()
})
afterAll(async () => {
  await browser?.close()
})

describe('the rulebook page', () => {
  for (const [name, device] of [['phone', phone], ['laptop', laptop]] as const) {
    it(`lists the four jurisdictions and shows each clause's source and basis on a ${name}`, async () => {
      const { context, page } = await newPage(browser, device)
      try {
        await signInThroughPage(page, accounts.manager)
        await page.goto('/rulebook')
        await page.getByRole('heading', { level: 1, name: 'Rulebook' }).waitFor()
        await page.getByText('Tautline supports judgement; it does not certify.').first().waitFor()
        const regions = page.getByRole('navigation', { name: 'Jurisdictions' })
        for (const j of ['Australia', 'Canada', 'United States', 'European Union']) {
          await regions.getByRole('link', { name: new RegExp(j) }).waitFor()
        }
        const loop = clause(page, 'au.loop-reach')
        expect(await loop.innerText()).toMatch(/Source:\s*Competition and Consumer \(Corded Internal Window Coverings\) Safety Standard 2014, s 6\(1\)\(a\)/)
        expect(await loop.innerText()).toMatch(/220 mm/)
        expect(await loop.innerText()).toMatch(/1,600 mm/)
        expect(await loop.innerText()).toMatch(/Basis:\s*Published text/)
        expect(await seriousViolations(page), 'rulebook, Australia').toEqual([])

        // Canada's clauses link to the regulation; withdrawn US history is marked as such.
        await regions.getByRole('link', { name: /Canada/ }).click()
        await page.getByRole('heading', { level: 2, name: /Canada/ }).waitFor()
        const sourceLink = clause(page, 'ca.loop-perimeter').getByRole('link', { name: /SOR\/2019-97/ })
        expect(await sourceLink.getAttribute('href')).toMatch(/^https:\/\//)
        await regions.getByRole('link', { name: /United States/ }).click()
        await page.getByRole('heading', { level: 3, name: /Withdrawn history/ }).waitFor()
        await clause(page, 'us.cfr-1260-withdrawn').getByText(/Withdrawn: kept as history, decides nothing/).waitFor()
        await page.locator('article').filter({ hasText: 'Advice: never decides a verdict' }).first().waitFor()
        expect(await seriousViolations(page), 'rulebook, United States').toEqual([])
      }
      finally {
        await context.close()
      }
    })
  }
})
