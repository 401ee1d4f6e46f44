import { describe, expect, it } from 'vitest'
import { caBase, check, clause } from './fixtures'

// Source: Corded Window Coverings Regulations, SOR/2019-97 (sections named per test); Health Canada industry guidance.

const freeCord = {
  control: 'free_cord' as const,
  productType: 'roller' as const,
  freeCordLengthMm: 200,
  jointFreeCordsMm: 0,
  loopPerimeterMm: 0,
  loopPullOutMm: 0,
  cordSpanMm: null,
}

describe('CA rule set as a whole', () => {
  it('a 20 cm chain loop with a 40 cm perimeter and labels is compliant (SOR/2019-97 ss 6, 7, 15)', () => {
    expect(check(caBase).verdict).toBe('compliant')
  })

  it('a short free cord is compliant (SOR/2019-97 ss 5, 7, 8)', () => {
    expect(check(caBase, freeCord).verdict).toBe('compliant')
  })

  it('a cordless roller has no cords: not_applicable (SOR/2019-97 s 1, cord definition)', () => {
    expect(check(caBase, { control: 'cordless' }).verdict).toBe('not_applicable')
  })

  it('a cordless venetian still has reachable inner cords, so the span and loop clauses apply (SOR/2019-97 ss 1, 6, 7)', () => {
    const r = check(caBase, { control: 'cordless', productType: 'venetian', cordSpanMm: null, loopPerimeterMm: null, loopPullOutMm: null })
    expect(r.verdict).toBe('incomplete')
    expect(r.findings.find(f => f.clause === 'ca.contact-span')).toMatchObject({ verdict: 'missing', field: 'cordSpanMm' })
  })
})

describe('ca.free-end-cord — SOR/2019-97 s 5: free-end cord no longer than 22 cm at 35 N', () => {
  it('220 mm passes, 221 mm fails', () => {
    expect(clause('ca.free-end-cord', caBase, { ...freeCord, freeCordLengthMm: 220 })).toMatchObject({ verdict: 'pass', limit: 220 })
    const f = clause('ca.free-end-cord', caBase, { ...freeCord, freeCordLengthMm: 221 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 221, limit: 220, unit: 'mm', field: 'freeCordLengthMm', basis: 'published' })
    expect(f.fix).toMatch(/cord shield/)
  })

  it('height does not make a cord unreachable (SOR/2019-97 s 1, "reachable")', () => {
    expect(clause('ca.free-end-cord', caBase, { ...freeCord, freeCordLengthMm: 300, lowestCordPointMm: 2000 }).verdict).toBe('fail')
  })

  it('a free cord of unrecorded length is missing; a loop with no free end recorded is not applicable', () => {
    expect(clause('ca.free-end-cord', caBase, { ...freeCord, freeCordLengthMm: null })).toMatchObject({ verdict: 'missing', field: 'freeCordLengthMm' })
    expect(clause('ca.free-end-cord', caBase).verdict).toBe('not_applicable')
    expect(clause('ca.free-end-cord', caBase, { freeCordLengthMm: 300 }).verdict).toBe('fail')
  })
})

describe('ca.contact-span — SOR/2019-97 s 6: span between contact points no longer than 22 cm at 35 N', () => {
  it('220 mm passes, 221 mm fails', () => {
    expect(clause('ca.contact-span', caBase, { cordSpanMm: 220 }).verdict).toBe('pass')
    const f = clause('ca.contact-span', caBase, { cordSpanMm: 221 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 221, limit: 220, field: 'cordSpanMm' })
    expect(f.fix).toMatch(/tension device does not shorten/)
  })

  it('unrecorded, with no perimeter recorded either, is missing cordSpanMm', () => {
    expect(clause('ca.contact-span', caBase, { cordSpanMm: null, loopPerimeterMm: null })).toMatchObject({ verdict: 'missing', field: 'cordSpanMm' })
  })

  it('a recorded perimeter of 440 mm or less bounds every span to 220 mm, so the span is not asked for; 441 mm still asks (SOR/2019-97 ss 6 and 7)', () => {
    expect(clause('ca.contact-span', caBase, { cordSpanMm: null, loopPerimeterMm: 440 })).toMatchObject({ verdict: 'pass', field: 'loopPerimeterMm', measured: 440, limit: 440 })
    expect(clause('ca.contact-span', caBase, { cordSpanMm: null, loopPerimeterMm: 441 })).toMatchObject({ verdict: 'missing', field: 'cordSpanMm' })
    expect(check(caBase, { cordSpanMm: null }).verdict).toBe('compliant')
  })

  it('does not cover a free cord on a product without inner cords', () => {
    expect(clause('ca.contact-span', caBase, freeCord).verdict).toBe('not_applicable')
    expect(clause('ca.contact-span', caBase, { ...freeCord, productType: 'roman', cordSpanMm: 100 }).verdict).toBe('pass')
  })
})

describe('ca.loop-perimeter — SOR/2019-97 s 7: no loop larger than 44 cm around at 35 N', () => {
  it('440 mm passes, 441 mm fails', () => {
    expect(clause('ca.loop-perimeter', caBase, { loopPerimeterMm: 440, loopPullOutMm: null })).toMatchObject({ verdict: 'pass', field: 'loopPerimeterMm' })
    expect(clause('ca.loop-perimeter', caBase, { loopPerimeterMm: 441, loopPullOutMm: null })).toMatchObject({
      verdict: 'fail',
      measured: 441,
      limit: 440,
      field: 'loopPerimeterMm',
    })
  })

  it('220 mm pulled out is a 440 mm perimeter and passes; 221 mm fails (SOR/2019-97 s 7)', () => {
    expect(clause('ca.loop-perimeter', caBase, { loopPerimeterMm: null, loopPullOutMm: 220 })).toMatchObject({ verdict: 'pass', measured: 440 })
    expect(clause('ca.loop-perimeter', caBase, { loopPerimeterMm: null, loopPullOutMm: 221 })).toMatchObject({
      verdict: 'fail',
      measured: 442,
      field: 'loopPullOutMm',
    })
  })

  it('the larger of the two measurements decides (SOR/2019-97 s 7; stricter reading)', () => {
    expect(clause('ca.loop-perimeter', caBase, { loopPerimeterMm: 300, loopPullOutMm: 230 }).verdict).toBe('fail')
  })

  it('unmeasured is missing loopPerimeterMm', () => {
    expect(clause('ca.loop-perimeter', caBase, { loopPerimeterMm: null, loopPullOutMm: null })).toMatchObject({ verdict: 'missing', field: 'loopPerimeterMm' })
  })
})

describe('ca.joined-cords — SOR/2019-97 s 8 (secondary mapping): joinable free ends count as one cord', () => {
  it('220 mm passes, 221 mm fails, unrecorded is missing', () => {
    expect(clause('ca.joined-cords', caBase, { ...freeCord, jointFreeCordsMm: 220 })).toMatchObject({ verdict: 'pass', basis: 'secondary' })
    expect(clause('ca.joined-cords', caBase, { ...freeCord, jointFreeCordsMm: 221 })).toMatchObject({ verdict: 'fail', limit: 220 })
    expect(clause('ca.joined-cords', caBase, { ...freeCord, jointFreeCordsMm: null })).toMatchObject({ verdict: 'missing', field: 'jointFreeCordsMm' })
  })

  it('does not cover loops', () => {
    expect(clause('ca.joined-cords', caBase).verdict).toBe('not_applicable')
  })
})

describe('labels — SOR/2019-97 s 15 (published) and information requirements of SOR/2019-97 (seen in a laboratory summary, secondary)', () => {
  it.each([
    ['ca.warning', 'warningLabel', 'published'],
    ['ca.information', 'manufacturerLabel', 'secondary'],
  ] as const)('%s: true passes, false fails, null is missing', (id, field, basis) => {
    expect(clause(id, caBase, { [field]: true })).toMatchObject({ verdict: 'pass', basis })
    expect(clause(id, caBase, { [field]: false })).toMatchObject({ verdict: 'fail', field })
    expect(clause(id, caBase, { [field]: null })).toMatchObject({ verdict: 'missing', field })
  })
})

describe('dates — SOR/2019-97 in force 1 May 2021', () => {
  const over = { cordSpanMm: 500 }

  it('made April 2021 and installed 30 April 2021 is not covered; made May 2021 is', () => {
    expect(clause('ca.contact-span', caBase, { ...over, manufacturedOn: '2021-04', installedOn: '2021-04-30' }).verdict).toBe('not_applicable')
    expect(clause('ca.contact-span', caBase, { ...over, manufacturedOn: '2021-05', installedOn: '2021-05-01' }).verdict).toBe('fail')
  })

  it('made before but installed (sold) from 1 May 2021 is covered (stricter reading: sale date not recorded)', () => {
    expect(clause('ca.contact-span', caBase, { ...over, manufacturedOn: '2021-04', installedOn: '2021-05-01' }).verdict).toBe('fail')
  })

  it('no dates recorded: checked as of today, and the message says so', () => {
    const f = clause('ca.contact-span', caBase, { ...over, manufacturedOn: null, installedOn: null })
    expect(f.verdict).toBe('fail')
    expect(f.message).toMatch(/not recorded: checked as if it were 2026-12-01/)
  })
})

describe('laboratory checks — SOR/2019-97 s 2 (small parts, 90 N) and s 3 (lead, 90 mg/kg): advice only', () => {
  it('point to the supplier declaration and never make a record incomplete', () => {
    const r = check(caBase)
    for (const id of ['ca.small-parts', 'ca.lead']) {
      const f = r.findings.find(x => x.clause === id)!
      expect(f.verdict).toBe('advice')
      expect(f.fix).toMatch(/supplier's declaration/)
    }
    expect(r.findings.find(x => x.clause === 'ca.small-parts')!.message).toMatch(/90 N/)
    expect(r.findings.find(x => x.clause === 'ca.lead')!.message).toMatch(/90 mg\/kg/)
    expect(r.verdict).toBe('compliant')
  })
})

describe('the longer cord decides — SOR/2019-97 s 5', () => {
  it('on a free-cord control a 0 mm free cord does not hide a 600 mm operating cord; 220 mm each way passes', () => {
    expect(clause('ca.free-end-cord', caBase, { ...freeCord, freeCordLengthMm: 0, operatingCordLengthMm: 600 })).toMatchObject({ verdict: 'fail', measured: 600, field: 'operatingCordLengthMm' })
    expect(clause('ca.free-end-cord', caBase, { ...freeCord, freeCordLengthMm: 220, operatingCordLengthMm: 0 }).verdict).toBe('pass')
  })
})

describe('inner cords — SOR/2019-97 s 1 (reachable), s 4 (unreachable cords stay so), s 7 (loops)', () => {
  const venetian = { control: 'cordless' as const, productType: 'venetian' as const, cordSpanMm: null, loopPerimeterMm: null, loopPullOutMm: null }

  it('inner cords recorded as out of reach are left to s 4: spans and loops not applicable, with s 4 advice', () => {
    const r = check(caBase, { ...venetian, innerCordsReachable: false })
    expect(r.findings.find(f => f.clause === 'ca.contact-span')!.verdict).toBe('not_applicable')
    expect(r.findings.find(f => f.clause === 'ca.loop-perimeter')!.verdict).toBe('not_applicable')
    expect(r.findings.find(f => f.clause === 'ca.unreachable-cords')).toMatchObject({ verdict: 'advice', field: 'innerCordsReachable' })
    expect(r.verdict).toBe('compliant')
  })

  it('reachable (or not recorded) inner cords are measured: missing until they are', () => {
    expect(clause('ca.contact-span', caBase, { ...venetian, innerCordsReachable: true })).toMatchObject({ verdict: 'missing', field: 'cordSpanMm' })
    expect(clause('ca.loop-perimeter', caBase, { ...venetian, innerCordsReachable: null }).verdict).toBe('missing')
  })

  it('an inner loop pulled out 221 mm is 442 mm round and fails; 220 mm passes (s 7)', () => {
    expect(clause('ca.loop-perimeter', caBase, { ...venetian, innerLoopPullOutMm: 221 })).toMatchObject({ verdict: 'fail', measured: 442, field: 'innerLoopPullOutMm' })
    expect(clause('ca.loop-perimeter', caBase, { ...venetian, innerLoopPullOutMm: 220 }).verdict).toBe('pass')
  })
})

describe('ca.bilingual-information — information in English and French (SOR/2019-97, read through industry guidance: secondary)', () => {
  it('true passes, false fails, null is missing; the information clauses rest on SOR/2019-97 itself', () => {
    expect(clause('ca.bilingual-information', caBase).verdict).toBe('pass')
    expect(clause('ca.bilingual-information', caBase, { bilingualInformation: false })).toMatchObject({ verdict: 'fail', field: 'bilingualInformation' })
    expect(clause('ca.bilingual-information', caBase, { bilingualInformation: null }).verdict).toBe('missing')
    for (const id of ['ca.information', 'ca.bilingual-information']) expect(clause(id, caBase).source, id).toMatch(/^Corded Window Coverings Regulations, SOR\/2019-97, /)
  })
})
