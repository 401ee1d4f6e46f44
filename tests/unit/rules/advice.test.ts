import { describe, expect, it } from 'vitest'
import { ruleSets } from '../../../rules'
import { auBase, caBase, check, clause, euBase, usCustomLoopBase } from './fixtures'

// Advice never fails a covering. Sources: Health Canada, NSAI, Hackney TS (furniture; published); CPSC and
// Health Canada (cordless in children's rooms; published); common practice (ease ~10 mm, screws not adhesive, stop beads).

const bases = { AU: auBase, CA: caBase, US: usCustomLoopBase, EU: euBase }

describe('shared advice is in every rule set', () => {
  it.each(Object.keys(bases))('%s carries the five shared advice clauses', (j) => {
    const ids = ruleSets[j as keyof typeof bases].clauses.map(c => c.id)
    for (const id of ['advice.furniture-away', 'advice.cordless-for-children', 'advice.ease-tension', 'advice.screw-fixings', 'advice.stop-bead']) {
      expect(ids).toContain(id)
    }
  })
})

describe('advice.furniture-away — Health Canada, NSAI, Hackney Trading Standards (published)', () => {
  it('advises moving climbable furniture, in every case, and never fails', () => {
    expect(clause('advice.furniture-away', auBase, { climbableFurnitureNearby: true })).toMatchObject({
      verdict: 'advice',
      field: 'climbableFurnitureNearby',
      measured: true,
    })
    expect(clause('advice.furniture-away', auBase, { climbableFurnitureNearby: false }).verdict).toBe('advice')
    expect(clause('advice.furniture-away', auBase, { climbableFurnitureNearby: null }).message).toMatch(/Not recorded/)
    expect(check(auBase, { climbableFurnitureNearby: true }).verdict).toBe('compliant')
  })
})

describe('advice.cordless-for-children — CPSC and Health Canada (published)', () => {
  it('advises cordless in a child\'s room or childcare premises, otherwise not applicable', () => {
    expect(clause('advice.cordless-for-children', auBase, { childrensRoom: true }).verdict).toBe('advice')
    expect(clause('advice.cordless-for-children', auBase, { premises: 'childcare' })).toMatchObject({ verdict: 'advice', field: 'premises' })
    expect(clause('advice.cordless-for-children', auBase).verdict).toBe('not_applicable')
    expect(check(auBase, { childrensRoom: true, premises: 'childcare' }).verdict).toBe('compliant')
  })
})

describe('advice.ease-tension — common practice: taut, then ease about 10 mm', () => {
  it('advises easing 10 mm when a tension device holds the loop', () => {
    const f = clause('advice.ease-tension', auBase)
    expect(f).toMatchObject({ verdict: 'advice', basis: 'common_practice', source: 'common practice, fitting a tension device' })
    expect(f.message).toMatch(/about 10 mm/)
    expect(clause('advice.ease-tension', auBase, { tensionDevice: false }).verdict).toBe('not_applicable')
  })
})

describe('advice.screw-fixings — common practice: screws into solid material, never adhesive', () => {
  it('advises on devices and cleats only', () => {
    expect(clause('advice.screw-fixings', auBase).fix).toMatch(/never with adhesive/)
    expect(clause('advice.screw-fixings', auBase, { tensionDevice: false, cleat: true, cleatHeightMm: 1700 }).verdict).toBe('advice')
    expect(clause('advice.screw-fixings', auBase, { tensionDevice: false, cleat: false }).verdict).toBe('not_applicable')
  })
})

describe('advice.stop-bead — common practice: a stop bead is not a safety device', () => {
  it('advises on bead chains only', () => {
    expect(clause('advice.stop-bead', auBase).message).toMatch(/does not protect a child/)
    expect(clause('advice.stop-bead', auBase, { control: 'cord_loop' }).verdict).toBe('not_applicable')
  })
})

describe('advice never changes a verdict (common practice and published advice alike)', () => {
  it('a record with every advice trigger keeps its verdict in every jurisdiction', () => {
    const triggers = { climbableFurnitureNearby: true, childrensRoom: true, premises: 'childcare' as const }
    for (const base of Object.values(bases)) {
      expect(check(base, triggers).verdict).toBe(check(base).verdict)
    }
  })
})

describe('advice.screw-fixings: fixings into solid material (common practice; ACCC installation guide, fixing options)', () => {
  it('names adhesive as the thing to change, and never fails the covering', async () => {
    const { checkRecord, coveringRecordSchema } = await import('../../../rules')
    const record = coveringRecordSchema.parse({
      ref: 'ADH-1', jurisdiction: 'AU', premises: 'home', installedOn: '2026-05-01', productType: 'roller', control: 'chain_loop',
      headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 20, tensionDevice: true, tensionDeviceHeightMm: 900,
      tensionDeviceHoldN: 80, tensionDeviceTamperProof: true, deviceFixing: 'adhesive',
      warningLabel: true, swingTag: true, installerLabel: true,
    })
    const result = checkRecord(record, { today: '2026-12-01' })
    const finding = result.findings.find(f => f.clause === 'advice.screw-fixings')!
    expect(finding.verdict).toBe('advice')
    expect(finding.field).toBe('deviceFixing')
    expect(finding.message).toMatch(/adhesive/)
    expect(result.verdict).not.toBe('non_compliant')
  })
})
