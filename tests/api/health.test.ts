import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { ApiClient, accounts, signIn } from '../support/api'

describe('health and request logs', () => {
  it('reports the database, photo storage and mail relay without a session and without secrets', async () => {
    const r = await new ApiClient().get('/api/health')
    expect(r.status).toBe(200)
    expect(r.body).toMatchObject({ status: 'ok', database: 'up', storage: 'up', mail: 'up' })
    const text = JSON.stringify(r.body)
    for (const secret of ['postgres://', '127.0.0.1', 'S3RVER', process.env.NUXT_SESSION_PASSWORD ?? 'no-secret']) expect(text).not.toContain(secret)
    expect(r.body).not.toHaveProperty('evidence')
  })

  it('gives a signed-in admin the tamper-evidence line for their own workspace', async () => {
    const r = await (await signIn(accounts.admin)).get('/api/health')
    expect(r.status).toBe(200)
    expect(r.body.evidence).toMatchObject({ status: 'intact', firstBreak: null })
    expect(r.body.evidence.rows).toBeGreaterThan(0)
    expect((await (await signIn(accounts.officer)).get('/api/health')).body).not.toHaveProperty('evidence')
  })

  it('writes one JSON line per request with its id, and never a password, cookie or query string', async () => {
    const client = new ApiClient()
    const id = `test-${Date.now()}`
    const login = await client.request('POST', '/api/auth/login?token=should-not-be-logged', { email: accounts.installer, password: 'tautline-demo' }, { 'x-request-id': id })
    expect(login.headers.get('x-request-id')).toBe(id)
    await new Promise(r => setTimeout(r, 200))
    const lines = readFileSync(process.env.LOG_FILE!, 'utf8').trim().split('\n')
    const mine = lines.map(l => JSON.parse(l) as Record<string, unknown>).filter(l => l.id === id)
    expect(mine).toHaveLength(1)
    expect(mine[0]).toMatchObject({ method: 'POST', path: '/api/auth/login', status: 200, level: 'info' })
    const raw = lines.find(l => l.includes(id))!
    expect(raw).not.toMatch(/tautline-demo|should-not-be-logged|nuxt-session|cookie/i)
  })
})
