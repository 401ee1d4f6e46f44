import { beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, accounts, signIn } from '../support/api'

let installer: ApiClient
beforeAll(async () => { installer = await signIn(accounts.installer) })

const chain = {
  ref: 'API-1', jurisdiction: 'AU', premises: 'rental_home', installedOn: '2026-03-02', productType: 'roller', control: 'chain_loop',
  headHeightMm: 2100, lowestCordPointMm: 1000, loopPullOutMm: 310, tensionDevice: false, warningLabel: true, swingTag: true, installerLabel: true,
  installedPerInstructions: true,
}

describe('POST /api/checks', () => {
  it('fails a 310 mm loop within 1600 mm of the floor (AU Safety Standard 2014 s 6(1)(a): loops of 220 mm or longer)', async () => {
    const r = await installer.post('/api/checks', chain)
    expect(r.status).toBe(200)
    expect(r.body.verdict).toBe('non_compliant')
    expect(r.body.rulesVersion).toMatch(/^AU-/)
    const loop = r.body.findings.find((f: { clause: string }) => f.clause === 'au.loop-reach')
    expect(loop).toMatchObject({ verdict: 'fail', measured: 310, limit: 220, unit: 'mm', field: 'loopPullOutMm', basis: 'published' })
    expect(loop.source).toMatch(/2014/)
    expect(loop.fix).toBeTruthy()
  })

  it('passes the same covering once a tension device holds the loop taut (AU s 6(1)(a); ACCC guide: 70 N for 10 s)', async () => {
    const r = await installer.post('/api/checks', { ...chain, loopPullOutMm: 20, lowestCordPointMm: 900, tensionDevice: true, tensionDeviceHeightMm: 900, tensionDeviceHoldN: 75, tensionDeviceTamperProof: true })
    expect(r.body.verdict).toBe('compliant')
  })

  it('rejects an unknown enum value with the field named, and ignores unknown extra fields', async () => {
    const bad = await installer.post('/api/checks', { ...chain, control: 'string_pull' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^control/)
    const extra = await installer.post('/api/checks', { ...chain, colour: 'oatmeal' })
    expect(extra.status).toBe(200)
  })

  it('rejects an impossible length with the field named', async () => {
    const r = await installer.post('/api/checks', { ...chain, loopPullOutMm: -1 })
    expect(r.status).toBe(400)
    expect(r.body.data.fields.loopPullOutMm).toBeTruthy()
  })

  it('needs a session', async () => {
    expect((await new ApiClient().post('/api/checks', chain)).status).toBe(401)
  })
})

describe('GET /api/rules', () => {
  it('lists the four rule sets with versions and every clause\'s source and basis', async () => {
    const r = await installer.get('/api/rules')
    expect(r.status).toBe(200)
    expect(r.body.map((s: { jurisdiction: string }) => s.jurisdiction)).toEqual(['AU', 'CA', 'US', 'EU'])
    for (const set of r.body) {
      expect(set.version).toMatch(new RegExp(`^${set.jurisdiction}-`))
      for (const c of set.clauses) {
        expect(c.source.document, c.id).toBeTruthy()
        expect(['published', 'secondary', 'common_practice', 'memory']).toContain(c.basis)
      }
    }
    const withdrawn = r.body.find((s: { jurisdiction: string }) => s.jurisdiction === 'US').clauses.find((c: { id: string }) => c.id === 'us.cfr-1260-withdrawn')
    expect(withdrawn.kind).toBe('history')
  })
})
