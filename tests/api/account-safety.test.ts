import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { ApiClient, accounts, database, fixtureIds, signIn } from '../support/api'
import { linkIn, messagesTo, waitForMail } from '../support/mail'

// Sign-in limits under concurrency, throttles on reset and audit-request mail, one live link per person, and
// invitation answers that say nothing about other workspaces. Every request here comes from 127.0.0.1.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
const stamp = Date.now()

/** A fresh account of the first workspace with the demo password, so no other test's counts touch it. */
async function freshAccount(label: string, role = 'installer', clientId: number | null = null) {
  const email = `${label}.${stamp}@demo.tautline.test`
  await db.query(`INSERT INTO users (workspace_id, client_id, email, name, role, password_hash)
    SELECT workspace_id, $3, $1, 'Fresh Account', $2, password_hash FROM users WHERE email = $4`, [email, role, clientId, accounts.installer])
  return email
}
const login = (email: string, password: string) => new ApiClient().post('/api/auth/login', { email, password })
const pause = (ms: number) => new Promise(r => setTimeout(r, ms))

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
})
afterAll(async () => {
  // Leave no counter behind for the files that run after this one from the same address.
  await db?.query(`DELETE FROM rate_limits WHERE key LIKE 'signin:address:%' OR key LIKE 'reset:%' OR key LIKE 'audit-request:%'`).catch(() => undefined)
  await db?.end()
})

describe('sign-in limits', () => {
  it('checks at most 5 of 12 wrong passwords sent at once for one account; the rest are refused unchecked', async () => {
    const email = await freshAccount('concurrent')
    const replies = await Promise.all(Array.from({ length: 12 }, () => login(email, 'wrong-password-1')))
    const checked = replies.filter(r => r.status === 401).length
    const refused = replies.filter(r => r.status === 429).length
    expect(checked, `statuses ${replies.map(r => r.status).join(',')}`).toBeLessThanOrEqual(5)
    expect(checked + refused).toBe(12)
    // Locked now, even with the right password.
    expect((await login(email, 'tautline-demo')).status).toBe(429)
  })

  it('names the wait in minutes and sends Retry-After', async () => {
    const email = await freshAccount('wait')
    for (let i = 0; i < 5; i++) expect((await login(email, 'wrong-password-1')).status).toBe(401)
    const locked = await login(email, 'wrong-password-1')
    expect(locked.status).toBe(429)
    const minutes = Number(locked.body.message.match(/Try again in (\d+) minutes?/)?.[1])
    expect(minutes).toBeGreaterThanOrEqual(1)
    expect(minutes).toBeLessThanOrEqual(15)
    const retryAfter = Number(locked.headers.get('retry-after'))
    expect(retryAfter).toBeGreaterThan(0)
    expect(retryAfter).toBeLessThanOrEqual(15 * 60)
  })

  it('does not lock a colleague out after other people\'s failures from the same address', async () => {
    const colleague = await freshAccount('colleague')
    // 35 failures over 7 other addresses of the same office connection: more than the old per-address limit of 30.
    for (let person = 0; person < 7; person++) {
      await Promise.all(Array.from({ length: 5 }, () => login(`typo${person}.${stamp}@demo.tautline.test`, 'wrong-password-1')))
    }
    const r = await login(colleague, 'tautline-demo')
    expect(r.status, JSON.stringify(r.body)).toBe(200)
  })

  it('keeps a per-address ceiling, and does not advise a reset that could not help', async () => {
    const colleague = await freshAccount('ceiling')
    await login(colleague, 'wrong-password-1')
    const { rowCount } = await db.query(`UPDATE rate_limits SET hits = 100000 WHERE key LIKE 'signin:address:%'`)
    expect(rowCount).toBeGreaterThan(0)
    try {
      const r = await login(colleague, 'tautline-demo')
      expect(r.status).toBe(429)
      expect(r.body.message).toMatch(/Try again in \d+ minutes?/)
      expect(r.body.message).not.toMatch(/reset/i)
    }
    finally {
      await db.query(`DELETE FROM rate_limits WHERE key LIKE 'signin:address:%'`)
    }
    expect((await login(colleague, 'tautline-demo')).status).toBe(200)
  })

  it('a password reset lifts the account\'s lock, as its message says', async () => {
    const email = await freshAccount('unlock')
    for (let i = 0; i < 6; i++) await login(email, 'wrong-password-1')
    const locked = await login(email, 'tautline-demo')
    expect(locked.status).toBe(429)
    expect(locked.body.message).toMatch(/reset your password/)
    await new ApiClient().post('/api/auth/reset-request', { email })
    const token = linkIn(await waitForMail(email), '/reset-password?token=').searchParams.get('token')!
    expect((await new ApiClient().post('/api/auth/reset', { token, password: 'unlocked-pass-42' })).status).toBe(200)
    expect((await login(email, 'unlocked-pass-42')).status).toBe(200)
  })
})

describe('throttles on mail anyone can cause', () => {
  it('sends at most 3 reset mails to one account in a row of 8 requests, with the same answer each time', async () => {
    await db.query(`DELETE FROM rate_limits WHERE key LIKE 'reset:address:%'`).catch(() => undefined)
    const email = await freshAccount('resets')
    const replies = []
    for (let i = 0; i < 8; i++) replies.push(await new ApiClient().post('/api/auth/reset-request', { email }))
    const unknown = await new ApiClient().post('/api/auth/reset-request', { email: `nobody.${stamp}@demo.tautline.test` })
    for (const r of [...replies, unknown]) {
      expect(r.status).toBe(200)
      expect(r.body).toEqual(replies[0]!.body)
    }
    await waitForMail(email, 2)
    await pause(500)
    expect(messagesTo(email)).toHaveLength(3)
  })

  it('refuses reset requests past the address\'s limit, alike for accounts that exist and that do not', async () => {
    await db.query(`DELETE FROM rate_limits WHERE key LIKE 'reset:address:%'`).catch(() => undefined)
    const known = await freshAccount('flood')
    let sent = 0
    let refused = null
    while (sent < 30 && !refused) {
      const r = await new ApiClient().post('/api/auth/reset-request', { email: `flood${sent}.${stamp}@nowhere.example` })
      sent++
      if (r.status === 429) refused = r
      else expect(r.status).toBe(200)
    }
    expect(refused, 'never refused').toBeTruthy()
    expect(sent).toBeLessThanOrEqual(11)
    expect(refused!.body.message).toMatch(/Try again in \d+ minutes?/)
    const forKnown = await new ApiClient().post('/api/auth/reset-request', { email: known })
    const forUnknown = await new ApiClient().post('/api/auth/reset-request', { email: `ghost.${stamp}@nowhere.example` })
    expect(forKnown.status).toBe(429)
    expect(forKnown.body).toEqual(forUnknown.body)
    await pause(300)
    expect(messagesTo(known)).toHaveLength(0)
    await db.query(`DELETE FROM rate_limits WHERE key LIKE 'reset:address:%'`).catch(() => undefined)
  })

  it('lets one manager send at most 5 audit requests an hour, and says when the next can go', async () => {
    const email = await freshAccount('auditor', 'manager', ids.own.client)
    const manager = await signIn(email)
    const statuses = []
    for (let i = 0; i < 7; i++) {
      const r = await manager.post('/api/portfolio/audit-requests', { siteIds: [ids.own.site] })
      statuses.push(r.status)
      if (r.status === 429) expect(r.body.message).toMatch(/next can go in \d+ minutes?/)
    }
    expect(statuses).toEqual([201, 201, 201, 201, 201, 429, 429])
    // Another manager is not held back by this one.
    expect((await (await signIn(await freshAccount('auditor2', 'manager', ids.own.client))).post('/api/portfolio/audit-requests', { siteIds: [ids.own.site] })).status).toBe(201)
  })
})

describe('one live link at a time', () => {
  it('resetting with the newer link revokes the older one and ends every session', async () => {
    const email = await freshAccount('twolinks')
    const session = await signIn(email)
    await new ApiClient().post('/api/auth/reset-request', { email })
    const older = linkIn(await waitForMail(email), '/reset-password?token=').searchParams.get('token')!
    await new ApiClient().post('/api/auth/reset-request', { email })
    const newer = linkIn(await waitForMail(email, 1), '/reset-password?token=').searchParams.get('token')!
    expect(newer).not.toBe(older)
    expect((await new ApiClient().post('/api/auth/reset', { token: newer, password: 'the-newer-pass-1' })).status).toBe(200)
    const stale = await new ApiClient().post('/api/auth/reset', { token: older, password: 'the-older-pass-1' })
    expect(stale.status).toBe(400)
    expect(stale.body.data.fields.token).toBeTruthy()
    expect((await session.get('/api/me')).status).toBe(401)
    expect((await login(email, 'the-older-pass-1')).status).toBe(401)
    await signIn(email, 'the-newer-pass-1')
  })

  it('accepting an invitation revokes a reset link sent meanwhile', async () => {
    const admin = await signIn(accounts.admin)
    const email = `invited.${stamp}@demo.tautline.test`
    expect((await admin.post('/api/users', { email, name: 'Invited Person', role: 'installer' })).status).toBe(201)
    const invite = linkIn(await waitForMail(email), '/welcome?token=').searchParams.get('token')!
    await new ApiClient().post('/api/auth/reset-request', { email })
    const reset = linkIn(await waitForMail(email, 1), '/reset-password?token=').searchParams.get('token')!
    expect((await new ApiClient().post('/api/auth/accept-invite', { token: invite, password: 'first-password-1' })).status).toBe(200)
    expect((await new ApiClient().post('/api/auth/reset', { token: reset, password: 'sneaky-password-1' })).status).toBe(400)
    await signIn(email, 'first-password-1')
  })
})

describe('invitation answers reveal nothing of other workspaces', () => {
  it('answers alike for an address used in another workspace and for one Tautline never invites', async () => {
    const other = await signIn(accounts.otherAdmin)
    const usedElsewhere = await other.post('/api/users', { email: accounts.officer, name: 'Some One', role: 'installer' })
    const unusable = await other.post('/api/users', { email: `postmaster@nowhere-${stamp}.example`, name: 'Some One', role: 'installer' })
    expect(usedElsewhere.status).toBe(unusable.status)
    expect(usedElsewhere.body).toEqual(unusable.body)
    expect(usedElsewhere.status).toBeGreaterThanOrEqual(400)
    expect(usedElsewhere.body.message).not.toMatch(/already has an account|another workspace/i)
    expect((await db.query('SELECT 1 FROM users WHERE email = $1', [`postmaster@nowhere-${stamp}.example`])).rowCount).toBe(0)
    // Nothing changed for the officer, and the other workspace caused no mail to them.
    expect((await db.query('SELECT workspace_id FROM users WHERE email = $1', [accounts.officer])).rows[0].workspace_id).not.toBe(
      (await db.query('SELECT workspace_id FROM users WHERE email = $1', [accounts.otherAdmin])).rows[0].workspace_id)
  })

  it('still tells an admin when the address is one of their own people', async () => {
    const admin = await signIn(accounts.admin)
    const r = await admin.post('/api/users', { email: accounts.officer, name: 'Again', role: 'officer' })
    expect(r.status).toBe(409)
    expect(r.body.message).toMatch(/your workspace/)
  })
})
