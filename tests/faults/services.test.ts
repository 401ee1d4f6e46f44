import { spawn } from 'node:child_process'
import { existsSync, openSync, readFileSync, writeFileSync } from 'node:fs'
import { connect } from 'node:net'
import { join } from 'node:path'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import { launch, newPage, signInThroughPage } from '../support/browser'
import { messagesTo, waitForMail } from '../support/mail'
import { testPng } from '../support/photos'
import type { RunningServer } from '../support/server'
import { freePort, startServer } from '../support/server'

// Photo storage and the mail relay going away, as seen over HTTP by a second process of the same built server.

function waitForPort(port: number, ms = 10_000) {
  const until = Date.now() + ms
  return new Promise<void>((resolve, reject) => {
    const attempt = () => {
      const s = connect(port, '127.0.0.1')
      s.once('connect', () => { s.destroy(); resolve() })
      s.once('error', () => {
        s.destroy()
        if (Date.now() > until) reject(new Error(`nothing on ${port}`))
        else setTimeout(attempt, 100)
      })
    }
    attempt()
  })
}

describe('photo storage unreachable', () => {
  let server: RunningServer

  beforeAll(async () => {
    server = await startServer({ S3_ENDPOINT: `http://127.0.0.1:${await freePort()}`, LOG_FILE: join(process.env.TEST_DATA_DIR ?? '/tmp', 'server-no-storage.log') })
  })
  afterAll(() => server?.stop())

  it('says so in the health check, and a photo upload answers 503 and leaves no row', async () => {
    const health = await fetch(`${server.base}/api/health`)
    expect(health.status).toBe(503)
    expect(await health.json()).toMatchObject({ status: 'degraded', database: 'up', storage: 'down' })

    const db = await database()
    const ids = await fixtureIds(db)
    const count = async () => Number((await db.query('SELECT count(*) AS n FROM photos')).rows[0].n)
    const before = await count()
    const installer = await signIn(accounts.installer, undefined, server.base)
    const form = new FormData()
    form.append('kind', 'tension_device')
    form.append('file', new Blob([new Uint8Array(await testPng(64, 48, 7))]), 'device.png')
    const r = await installer.request('POST', `/api/coverings/${ids.own.covering}/photos`, form)
    expect(r.status).toBe(503)
    expect(r.body.message).toMatch(/Photo storage is unreachable just now; nothing was saved/)
    expect(await count()).toBe(before)
    await db.end()
  })

  it('answers an import and a report e-mail with the same 503 message as a photo upload, and a Retry-After', async () => {
    const db = await database()
    const ids = await fixtureIds(db)
    await db.end()
    const officer = await signIn(accounts.officer, undefined, server.base)
    const form = new FormData()
    form.append('clientId', String(ids.own.client))
    form.append('file', new Blob(['site_ref,unit_ref\nWAT,U1\n']), 'units.csv')
    const imported = await officer.request('POST', '/api/imports', form)
    const emailed = await officer.post(`/api/sites/${ids.own.site}/report/email`, {})
    for (const r of [imported, emailed]) {
      expect(r.status, JSON.stringify(r.body)).toBe(503)
      expect(r.body.message).toBe('Photo storage is unreachable just now; nothing was saved or sent. Try again in a moment.')
      expect(r.headers.get('retry-after')).toBe('2')
    }
  })
})

// The shared SMTP fake that `npm test` runs is stopped, so no server process can deliver; a second server that
// retries every half second takes the report, queues it, and sends it once the fake is back on the same port.
const smtpPidFile = join(process.env.TEST_DATA_DIR ?? '', 'smtp.pid')
const smtpPort = Number(new URL(process.env.SMTP_URL ?? 'smtp://x:0').port)

describe.skipIf(!existsSync(smtpPidFile) || !process.env.MAIL_DIR)('mail relay unreachable', () => {
  let server: RunningServer
  let browser: Browser

  function startFake() {
    const out = openSync(join(process.env.TEST_DATA_DIR!, 'smtp.log'), 'a')
    const child = spawn(process.execPath, [join(process.cwd(), 'scripts', 'fakes', 'smtp.mjs'), '--port', String(smtpPort), '--dir', process.env.MAIL_DIR!], {
      detached: true, stdio: ['ignore', out, out],
    })
    // `npm test` stops it at the end by this file, as it does the one it started.
    writeFileSync(smtpPidFile, String(child.pid))
    child.unref()
    return waitForPort(smtpPort)
  }

  beforeAll(async () => {
    process.kill(Number(readFileSync(smtpPidFile, 'utf8')), 'SIGTERM')
    await new Promise(r => setTimeout(r, 300))
    server = await startServer({ REPORT_RETRY_BASE_MS: '1500', REPORT_RETRY_EVERY_MS: '500', LOG_FILE: join(process.env.TEST_DATA_DIR!, 'server-no-mail.log') })
    browser = await launch()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.stop()
    // Leave a relay running whatever happened.
    await waitForPort(smtpPort, 200).catch(() => startFake())
  })

  it('queues the report, says so on the page, and sends it once the relay is back', async () => {
    const health = await fetch(`${server.base}/api/health`)
    expect(health.status).toBe(503)
    expect(await health.json()).toMatchObject({ database: 'up', storage: 'up', mail: 'down' })

    const db = await database()
    const ids = await fixtureIds(db)
    await db.end()
    const to = `landlord-${Date.now()}@example.test`
    const { context, page } = await newPage(browser, undefined, server.base)
    await signInThroughPage(page, accounts.officer)
    await page.goto(`/sites/${ids.own.site}/reports`)
    await page.getByRole('button', { name: 'E-mail the report' }).click()
    await page.getByLabel('Send to').fill(to)
    await page.getByRole('button', { name: 'Send the report' }).click()
    const status = page.getByRole('status').filter({ hasText: 'Queued for retry.' })
    await status.waitFor({ timeout: 60_000 })
    await expect(status.textContent()).resolves.toMatch(/did not take the report just now; it is queued and will be retried automatically \(attempt 1 of 8\)/)
    const row = page.locator('li', { hasText: to })
    await row.getByText('Queued for retry').waitFor()
    expect(messagesTo(to)).toHaveLength(0)

    const officer = await signIn(accounts.officer, undefined, server.base)
    const queued = await officer.get(`/api/sites/${ids.own.site}/reports?page=1&pageSize=10`)
    const mine = queued.body.items.find((d: { to: string }) => d.to === to)
    expect(mine).toMatchObject({ status: 'queued', attempts: 1 })
    expect(mine.lastError).toBeTruthy()

    await startFake()
    const mail = await waitForMail(to, 0, 30_000)
    expect(mail.subject).toMatch(/report/i)
    expect(mail.raw).toMatch(/application\/pdf/)
    let sent: { status: string, attempts: number } | undefined
    for (let i = 0; i < 50 && sent?.status !== 'sent'; i++) {
      sent = (await officer.get(`/api/sites/${ids.own.site}/reports?page=1&pageSize=10`)).body.items.find((d: { to: string }) => d.to === to)
      if (sent?.status !== 'sent') await new Promise(r => setTimeout(r, 200))
    }
    expect(sent).toMatchObject({ status: 'sent' })
    expect(sent!.attempts).toBeGreaterThanOrEqual(2)
    await page.reload()
    await page.locator('li', { hasText: to }).getByText('Delivered to the mail server').waitFor()
    await context.close()
  }, 90_000)
})
