import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { chromium } from 'playwright-core'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { DEMO_PASSWORD, baseUrl } from './api'

// Debian's chromium, driven by playwright-core; no browser is ever downloaded.
export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'],
  })
}

export const phone = { viewport: { width: 390, height: 844 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true }
export const laptop = { viewport: { width: 1280, height: 800 } }

export async function newPage(browser: Browser, device: typeof phone | typeof laptop = laptop, base = baseUrl): Promise<{ context: BrowserContext, page: Page }> {
  const context = await browser.newContext({ ...device, baseURL: base })
  const page = await context.newPage()
  return { context, page }
}

export async function signInThroughPage(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto('/login')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(url => !url.pathname.startsWith('/login'))
}

const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')

export interface AxeViolation { id: string, impact: string | null, help: string, nodes: Array<{ target: string[] }> }

/** Runs axe-core in the page and returns the serious and critical violations. */
export async function seriousViolations(page: Page): Promise<AxeViolation[]> {
  await page.evaluate(axeSource)
  const violations = await page.evaluate(async () => {
    const w = window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }
    const r = await w.axe.run(document, { resultTypes: ['violations'] })
    return r.violations.map(v => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map(n => ({ target: n.target })) }))
  })
  return violations.filter(v => v.impact === 'serious' || v.impact === 'critical')
}
