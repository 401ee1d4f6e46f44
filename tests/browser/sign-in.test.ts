import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser } from 'playwright-core'
import { accounts } from '../support/api'
import { launch, laptop, newPage, phone, seriousViolations, signInThroughPage } from '../support/browser'

let browser: Browser
beforeAll(async () => { browser = await launch() })
afterAll(async () => { await browser?.close() })

describe('signing in and opening a site', () => {
  for (const [name, device] of [['laptop', laptop], ['phone', phone]] as const) {
    it(`an officer signs in and opens a site on a ${name}, and axe finds nothing serious`, async () => {
      const { context, page } = await newPage(browser, device)
      try {
        await page.goto('/sites')
        await page.waitForURL(/\/login/)
        expect(await seriousViolations(page), 'sign-in page').toEqual([])
        await signInThroughPage(page, accounts.officer)
        expect(await seriousViolations(page), 'home page').toEqual([])
        await page.goto('/sites')
        await page.getByRole('link', { name: /Wattle Court/ }).first().click()
        await page.waitForURL(/\/sites\/\d+/)
        await expect(page.getByRole('heading', { level: 1, name: /Wattle Court/ })).toBeTruthy()
        await page.getByText('27 Ironbark Street').first().waitFor()
        await page.getByRole('link', { name: 'WAT-1-02' }).first().waitFor()
        expect(await seriousViolations(page), 'site page').toEqual([])
      }
      finally {
        await context.close()
      }
    })
  }

  it('keeps a manager to their own client: another client\'s site reads as not found', async () => {
    const { context, page } = await newPage(browser)
    try {
      await signInThroughPage(page, accounts.manager)
      await page.goto('/sites')
      await page.getByRole('link', { name: /Wattle Court/ }).first().waitFor()
      expect(await page.getByText('Sprigwood Early Learning').count()).toBe(0)
    }
    finally {
      await context.close()
    }
  })

  it('a wrong password shows a message and stays on the sign-in page', async () => {
    const { context, page } = await newPage(browser, phone)
    try {
      await page.goto('/login')
      await page.getByLabel('E-mail').fill(accounts.installer)
      await page.getByLabel('Password').fill('not-my-password')
      await page.getByRole('button', { name: 'Sign in' }).click()
      await page.getByRole('alert').waitFor()
      expect(await page.getByRole('alert').innerText()).toMatch(/do not match/)
      expect(new URL(page.url()).pathname).toBe('/login')
    }
    finally {
      await context.close()
    }
  })
})
