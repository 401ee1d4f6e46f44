import { describe, expect, it } from 'vitest'
import { ApiClient, accounts, database, signIn } from '../support/api'
import { linkIn, messagesTo, waitForMail } from '../support/mail'

describe('sign-in', () => {
  it('signs in with the demo password and sets a sealed HttpOnly SameSite cookie', async () => {
    const client = new ApiClient()
    const res = await fetch(`${process.env.TEST_BASE_URL}/api/auth/login`, {
      method: 'POST', headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: accounts.officer, password: 'tautline-demo' }),
    })
    expect(res.status).toBe(200)
    const cookie = res.headers.getSetCookie().find(c => c.startsWith('nuxt-session='))!
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).not.toContain('officer@demo') // sealed, not readable
    client.cookie = cookie.split(';')[0]!
    const me = await client.get('/api/me')
    expect(me.status).toBe(200)
    expect(me.body.user).toMatchObject({ email: accounts.officer, role: 'officer' })
    expect(me.body.workspace.name).toBe('Tallowmere Blinds & Awnings')
    expect(JSON.stringify(me.body)).not.toMatch(/hash|scrypt/i)
  })

  it('gives the same answer for a wrong password and an unknown e-mail', async () => {
    const wrong = await new ApiClient().post('/api/auth/login', { email: accounts.admin, password: 'not-the-password' })
    const unknown = await new ApiClient().post('/api/auth/login', { email: 'nobody@demo.tautline.test', password: 'not-the-password' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.message).toBe(unknown.body.message)
  })

  it('names the field when the body is bad', async () => {
    const r = await new ApiClient().post('/api/auth/login', { email: 'not-an-email', password: 'x' })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^email/)
    expect(r.body.data.fields.email).toBeTruthy()
  })

  it('locks an account for a while after 5 failures, even with the right password, and says so', async () => {
    const db = await database()
    const email = 'ratelimit@demo.tautline.test'
    await db.query(`INSERT INTO users (workspace_id, email, name, role, password_hash)
      SELECT workspace_id, $1, 'Rate Limit', 'installer', password_hash FROM users WHERE email = $2`, [email, accounts.installer])
    await db.end()
    for (let i = 0; i < 5; i++) {
      expect((await new ApiClient().post('/api/auth/login', { email, password: 'wrong-password-1' })).status).toBe(401)
    }
    const locked = await new ApiClient().post('/api/auth/login', { email, password: 'tautline-demo' })
    expect(locked.status).toBe(429)
    expect(locked.body.message).toMatch(/Too many sign-in attempts/)
    // The same words for an address that has no account, so the limit reveals nothing.
    for (let i = 0; i < 5; i++) await new ApiClient().post('/api/auth/login', { email: 'ghost@demo.tautline.test', password: 'wrong-password-1' })
    const ghost = await new ApiClient().post('/api/auth/login', { email: 'ghost@demo.tautline.test', password: 'wrong-password-1' })
    expect(ghost.status).toBe(429)
    const words = (m: string) => m.replace(/\d+ minutes?/, 'N minutes')
    expect(words(ghost.body.message)).toBe(words(locked.body.message))
  })

  it('signs out: the old cookie no longer works', async () => {
    const client = await signIn(accounts.installer)
    const old = client.cookie
    expect((await client.post('/api/auth/logout')).status).toBe(200)
    // The session row is revoked, so even a copy of the old cookie is refused.
    expect((await new ApiClient(old).get('/api/me')).status).toBe(401)
  })
})

describe('invitations and password resets by e-mail', () => {
  it('an admin invites an installer, who chooses a password and signs in', async () => {
    const admin = await signIn(accounts.admin)
    const email = `new.fitter.${Date.now()}@demo.tautline.test`
    const r = await admin.post('/api/users', { email, name: 'New Fitter', role: 'installer' })
    expect(r.status).toBe(201)
    const mail = await waitForMail(email)
    expect(mail.subject).toMatch(/invited you/)
    const link = linkIn(mail, '/welcome?token=')
    const token = link.searchParams.get('token')!
    const weak = await new ApiClient().post('/api/auth/accept-invite', { token, password: 'short' })
    expect(weak.status).toBe(400)
    expect(weak.body.message).toMatch(/^password/)
    expect((await new ApiClient().post('/api/auth/accept-invite', { token, password: 'a-long-enough-pass' })).status).toBe(200)
    expect((await new ApiClient().post('/api/auth/accept-invite', { token, password: 'a-long-enough-pass' })).status).toBe(400)
    const me = await (await signIn(email, 'a-long-enough-pass')).get('/api/me')
    expect(me.body.user.role).toBe('installer')
  })

  it('a manager invitation needs a client of the same workspace', async () => {
    const admin = await signIn(accounts.admin)
    const r = await admin.post('/api/users', { email: 'mgr.noclient@demo.tautline.test', name: 'No Client', role: 'manager' })
    expect(r.status).toBe(400)
    expect(r.body.data.fields.clientId).toBeTruthy()
  })

  it('resets a password through the e-mailed link, and answers alike for unknown addresses', async () => {
    const db = await database()
    const email = `reset.${Date.now()}@demo.tautline.test`
    await db.query(`INSERT INTO users (workspace_id, email, name, role, password_hash)
      SELECT workspace_id, $1, 'Reset Me', 'officer', password_hash FROM users WHERE email = $2`, [email, accounts.officer])
    await db.end()
    const known = await new ApiClient().post('/api/auth/reset-request', { email })
    const unknown = await new ApiClient().post('/api/auth/reset-request', { email: 'no-such-person@demo.tautline.test' })
    expect(known.status).toBe(200)
    expect(unknown.status).toBe(200)
    expect(known.body).toEqual(unknown.body)
    expect(messagesTo('no-such-person@demo.tautline.test')).toHaveLength(0)
    const link = linkIn(await waitForMail(email), '/reset-password?token=')
    const token = link.searchParams.get('token')!
    expect((await new ApiClient().post('/api/auth/reset', { token, password: 'brand-new-pass-9' })).status).toBe(200)
    expect((await new ApiClient().post('/api/auth/login', { email, password: 'tautline-demo' })).status).toBe(401)
    await signIn(email, 'brand-new-pass-9')
  })
})
