import { describe, expect, it } from 'vitest'
import { premisesTypes, ruleSets } from '../../../rules'
import { check, clause, euBase } from './fixtures'

// Sources: EN 13120:2009+A1:2014 with EN 16433/16434 as explained in retailer guidance (secondary);
// PSFG / BBSA joint guidance (published); ES-SO guidance (secondary); Hampshire Trading Standards on scope (published).

describe('EU rule set as a whole', () => {
  it('a chain ending at 1600 mm with labels is compliant (EN 13120+A1, 1500 mm without a device)', () => {
    expect(check(euBase).verdict).toBe('compliant')
  })

  it('offices and industrial premises are outside the child-safety clauses; there only the child-free-premises marking is checked (Hampshire Trading Standards; EN 13120+A1, recalled)', () => {
    for (const premises of ['office', 'industrial'] as const) {
      const r = check(euBase, { premises, lowestCordPointMm: 100, warningLabel: false, childFreePremisesWarning: true })
      expect(r.verdict).toBe('compliant')
      expect(r.findings.filter(f => f.verdict !== 'not_applicable').map(f => f.clause)).toEqual(['eu.child-free-warning'])
      expect(check(euBase, { premises, childFreePremisesWarning: false }).verdict).toBe('non_compliant')
      expect(check(euBase, { premises, childFreePremisesWarning: null }).verdict).toBe('incomplete')
    }
    expect(clause('eu.child-free-warning', euBase).verdict).toBe('not_applicable')
  })

  it('homes, rentals, childcare, schools, hotels, healthcare and shops are inside the scope (Hampshire Trading Standards)', () => {
    for (const premises of premisesTypes.filter(p => p !== 'office' && p !== 'industrial')) {
      expect(check(euBase, { premises, lowestCordPointMm: 100 }).verdict).toBe('non_compliant')
    }
  })

  it('a motorised covering has no cords: not_applicable', () => {
    expect(check(euBase, { control: 'motorised' }).verdict).toBe('not_applicable')
  })
})

describe('eu.cord-height — EN 13120+A1 (secondary): 1500 mm, or 600 mm with a safety device', () => {
  const bare = { breakaway: false, tensionDevice: false }

  it('1500 mm passes without a device; 1499 mm without one fails', () => {
    expect(clause('eu.cord-height', euBase, { ...bare, lowestCordPointMm: 1500 })).toMatchObject({ verdict: 'pass', limit: 1500 })
    const f = clause('eu.cord-height', euBase, { ...bare, lowestCordPointMm: 1499 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 1499, limit: 1500, field: 'lowestCordPointMm', basis: 'secondary' })
    expect(f.fix).toMatch(/breakaway connector/)
  })

  const working = { tensionDevice: true, tensionDeviceHeightMm: 600, deviceFixing: 'timber' as const, tensionDeviceHoldsTaut: true, tensionDeviceTamperProof: true }

  it('between 600 and 1500 mm a breakaway, or a working tension device, passes (EN 16434 devices)', () => {
    expect(clause('eu.cord-height', euBase, { ...bare, lowestCordPointMm: 1499, breakaway: true }).verdict).toBe('pass')
    expect(clause('eu.cord-height', euBase, { ...bare, lowestCordPointMm: 600, breakaway: true }).verdict).toBe('pass')
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 600 })).toMatchObject({ verdict: 'pass', field: 'tensionDeviceHoldsTaut' })
  })

  it('a tension device on a slack chain is not a safety device: fails; not recorded is missing (EN 16434; Decision 2011/477/EU)', () => {
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 900, tensionDeviceHoldsTaut: false })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceHoldsTaut' })
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 900, tensionDeviceHoldsTaut: null })).toMatchObject({ verdict: 'missing', field: 'tensionDeviceHoldsTaut' })
    expect(clause('eu.cord-height', euBase, { ...bare, tensionDevice: true, lowestCordPointMm: 900 })).toMatchObject({ verdict: 'missing', field: 'tensionDeviceHeightMm' })
  })

  it('the device is read: fixed at 599 mm fails, 600 mm passes; stuck on with adhesive fails; a cord a child can take out fails', () => {
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 700, tensionDeviceHeightMm: 599 })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceHeightMm', limit: 600 })
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 700, tensionDeviceHeightMm: 600 }).verdict).toBe('pass')
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 700, deviceFixing: 'adhesive' })).toMatchObject({ verdict: 'fail', field: 'deviceFixing' })
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 700, deviceFixing: null })).toMatchObject({ verdict: 'missing', field: 'deviceFixing' })
    expect(clause('eu.cord-height', euBase, { ...bare, ...working, lowestCordPointMm: 700, tensionDeviceTamperProof: false })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceTamperProof' })
  })

  it('599 mm fails even with a breakaway or tension device (600 mm floor; stricter reading for tension devices)', () => {
    expect(clause('eu.cord-height', euBase, { lowestCordPointMm: 599, breakaway: true })).toMatchObject({ verdict: 'fail', limit: 600 })
    expect(clause('eu.cord-height', euBase, { lowestCordPointMm: 599, tensionDevice: true })).toMatchObject({ verdict: 'fail', limit: 600 })
  })

  it('device not recorded in the band is missing; unmeasured height is missing', () => {
    expect(clause('eu.cord-height', euBase, { lowestCordPointMm: 1000, breakaway: null, tensionDevice: false })).toMatchObject({
      verdict: 'missing',
      field: 'breakaway',
    })
    expect(clause('eu.cord-height', euBase, { lowestCordPointMm: 1000, breakaway: false, tensionDevice: null })).toMatchObject({
      verdict: 'missing',
      field: 'tensionDevice',
    })
    expect(clause('eu.cord-height', euBase, { lowestCordPointMm: null })).toMatchObject({ verdict: 'missing', field: 'lowestCordPointMm' })
  })
})

describe('eu.free-cord-length — EN 13120+A1 (secondary): hanging length ≤ head height − 1500 mm, or 1 m if unknown', () => {
  const free = { control: 'free_cord' as const, breakaway: false, tensionDevice: false, lowestCordPointMm: 1500 }

  it('headrail at 2500 mm: 1000 mm passes, 1001 mm fails', () => {
    expect(clause('eu.free-cord-length', euBase, { ...free, headHeightMm: 2500, freeCordLengthMm: 1000 })).toMatchObject({ verdict: 'pass', limit: 1000 })
    expect(clause('eu.free-cord-length', euBase, { ...free, headHeightMm: 2500, freeCordLengthMm: 1001, lowestCordPointMm: 1499 })).toMatchObject({
      verdict: 'fail',
      measured: 1001,
      limit: 1000,
    })
  })

  it('headrail height unknown: 1000 mm passes, 1001 mm fails', () => {
    expect(clause('eu.free-cord-length', euBase, { ...free, headHeightMm: null, freeCordLengthMm: 1000 }).verdict).toBe('pass')
    expect(clause('eu.free-cord-length', euBase, { ...free, headHeightMm: null, freeCordLengthMm: 1001 }).verdict).toBe('fail')
  })

  it('headrail below 1500 mm allows no free cord without a device', () => {
    expect(clause('eu.free-cord-length', euBase, { ...free, headHeightMm: 1400, lowestCordPointMm: 1300, freeCordLengthMm: 100 })).toMatchObject({
      verdict: 'fail',
      limit: 0,
    })
  })

  it('with a safety device the cord-height clause decides instead; unmeasured is missing', () => {
    expect(clause('eu.free-cord-length', euBase, { ...free, breakaway: true, freeCordLengthMm: 1200 }).verdict).toBe('not_applicable')
    expect(clause('eu.free-cord-length', euBase, { ...free, freeCordLengthMm: null })).toMatchObject({ verdict: 'missing', field: 'freeCordLengthMm' })
  })
})

describe('eu.rear-cords — EN 13120+A1 (secondary): rear cords more than 200 mm apart need a breakaway or stop', () => {
  const roman = { productType: 'roman' as const, breakaway: false, innerCordStops: false }

  it('200 mm passes; 201 mm with neither fails; 201 mm with stops or a breakaway passes', () => {
    expect(clause('eu.rear-cords', euBase, { ...roman, rearCordSpacingMm: 200 })).toMatchObject({ verdict: 'pass', limit: 200 })
    expect(clause('eu.rear-cords', euBase, { ...roman, rearCordSpacingMm: 201 })).toMatchObject({ verdict: 'fail', measured: 201, limit: 200 })
    expect(clause('eu.rear-cords', euBase, { ...roman, rearCordSpacingMm: 201, innerCordStops: true }).verdict).toBe('pass')
    expect(clause('eu.rear-cords', euBase, { ...roman, rearCordSpacingMm: 201, breakaway: true }).verdict).toBe('pass')
  })

  it('applies to a cordless roman blind (the rear cords remain); unmeasured is missing', () => {
    expect(clause('eu.rear-cords', euBase, { ...roman, control: 'cordless', rearCordSpacingMm: 300 }).verdict).toBe('fail')
    expect(clause('eu.rear-cords', euBase, { ...roman, rearCordSpacingMm: null })).toMatchObject({ verdict: 'missing', field: 'rearCordSpacingMm' })
  })

  it('does not apply to rollers, nor to an "other" product with no spacing recorded', () => {
    expect(clause('eu.rear-cords', euBase).verdict).toBe('not_applicable')
    expect(clause('eu.rear-cords', euBase, { productType: 'other', rearCordSpacingMm: null }).verdict).toBe('not_applicable')
  })
})

describe('labels — PSFG/BBSA guidance (published) and ES-SO guidance (secondary)', () => {
  it.each([
    ['eu.warning-label', 'warningLabel', 'published'],
    ['eu.maker-name', 'manufacturerLabel', 'secondary'],
    ['eu.installer-name', 'installerLabel', 'secondary'],
  ] as const)('%s: true passes, false fails, null is missing', (id, field, basis) => {
    expect(clause(id, euBase, { [field]: true })).toMatchObject({ verdict: 'pass', basis })
    expect(clause(id, euBase, { [field]: false })).toMatchObject({ verdict: 'fail', field })
    expect(clause(id, euBase, { [field]: null })).toMatchObject({ verdict: 'missing', field })
  })
})

describe('eu.breakaway-release — EN 16434 release force: sources disagree, so advice only', () => {
  it('advises keeping the test report when a breakaway is fitted, and sets no pass or fail', () => {
    const f = clause('eu.breakaway-release', euBase, { breakaway: true })
    expect(f.verdict).toBe('advice')
    expect(f.message).toMatch(/3 kg, 6 kg, about 7 kg/)
    expect(clause('eu.breakaway-release', euBase).verdict).toBe('not_applicable')
  })
})

describe('EU advice — BBSA (never knot cords, secondary); Hackney TS and NSAI (wands and tassels, published)', () => {
  it('gives advice on corded coverings and never changes the verdict', () => {
    const r = check(euBase)
    expect(r.findings.find(f => f.clause === 'advice.no-knots')!.verdict).toBe('advice')
    expect(r.findings.find(f => f.clause === 'advice.tassels-wands')!.message).toMatch(/1600 mm/)
    expect(r.verdict).toBe('compliant')
  })
})

describe('inner cords alone (EN 13120+A1 as summarised)', () => {
  it('a cordless roller is not_applicable; a cordless venetian is judged on its inner cords, a cordless roman on its rear and inner cords', () => {
    expect(check(euBase, { control: 'cordless', productType: 'roller' }).verdict).toBe('not_applicable')
    expect(check(euBase, { control: 'cordless', productType: 'venetian' }).verdict).toBe('incomplete')
    expect(check(euBase, { control: 'cordless', productType: 'venetian', innerCordStops: true }).verdict).toBe('compliant')
    expect(check(euBase, { control: 'cordless', productType: 'roman', rearCordSpacingMm: 150, innerCordStops: true }).verdict).toBe('compliant')
  })
})

describe('eu.inner-cords — EN 13120+A1 and EN 16434 inner cord stops; Decision 2011/477/EU names inner cords', () => {
  const venetian = { productType: 'venetian' as const, control: 'wand' as const }

  it('stops pass, no stops fail, unknown is missing; stops do not excuse a hazardous loop recorded; out of reach passes', () => {
    expect(clause('eu.inner-cords', euBase, { ...venetian, innerCordStops: true })).toMatchObject({ verdict: 'pass', basis: 'secondary' })
    expect(clause('eu.inner-cords', euBase, { ...venetian, innerCordStops: false })).toMatchObject({ verdict: 'fail', field: 'innerCordStops' })
    expect(clause('eu.inner-cords', euBase, { ...venetian, innerCordStops: null })).toMatchObject({ verdict: 'missing', field: 'innerCordStops' })
    expect(clause('eu.inner-cords', euBase, { ...venetian, innerCordStops: true, innerCordLoop: true })).toMatchObject({ verdict: 'fail', field: 'innerCordLoop' })
    expect(clause('eu.inner-cords', euBase, { ...venetian, innerCordStops: false, innerCordsReachable: false }).verdict).toBe('pass')
    expect(clause('eu.inner-cords', euBase).verdict).toBe('not_applicable')
  })

  it('cites the Commission decision behind EN 13120', () => {
    expect(clause('eu.inner-cords', euBase, venetian).source).toMatch(/2011\/477\/EU/)
  })
})

describe('eu.cleat-height — EN 13120+A1 as explained in retailer guidance (secondary): cleats at 1500 mm or higher', () => {
  it('1500 mm passes, 1499 mm fails, unknown height is missing, no cleat is not applicable', () => {
    expect(clause('eu.cleat-height', euBase, { cleat: true, cleatHeightMm: 1500 })).toMatchObject({ verdict: 'pass', limit: 1500 })
    expect(clause('eu.cleat-height', euBase, { cleat: true, cleatHeightMm: 1499 })).toMatchObject({ verdict: 'fail', measured: 1499, limit: 1500 })
    expect(clause('eu.cleat-height', euBase, { cleat: true, cleatHeightMm: null })).toMatchObject({ verdict: 'missing', field: 'cleatHeightMm' })
    expect(clause('eu.cleat-height', euBase, { cleat: false }).verdict).toBe('not_applicable')
  })
})

describe('the longer cord decides — eu.free-cord-length (EN 13120+A1, secondary)', () => {
  it('a 0 mm free cord does not hide a 1200 mm operating cord under a 2500 mm headrail (limit 1000 mm)', () => {
    const free = { control: 'free_cord' as const, breakaway: false, tensionDevice: false, lowestCordPointMm: 1500, headHeightMm: 2500 }
    expect(clause('eu.free-cord-length', euBase, { ...free, freeCordLengthMm: 0, operatingCordLengthMm: 1200 })).toMatchObject({ verdict: 'fail', measured: 1200, field: 'operatingCordLengthMm' })
  })
})

describe('EN 13120:2009+A1:2014 does not reach installations before its release (CEN, 20 February 2014)', () => {
  it('installed 19 Feb 2014 is outside, 20 Feb 2014 inside', () => {
    const low = { lowestCordPointMm: 100, manufacturedOn: '2013-06' }
    expect(clause('eu.cord-height', euBase, { ...low, installedOn: '2014-02-19' }).verdict).toBe('not_applicable')
    expect(clause('eu.cord-height', euBase, { ...low, installedOn: '2014-02-20' }).verdict).toBe('fail')
  })

  it('the scope cites the Commission decisions and the General Product Safety Regulation (EU) 2023/988 from 13 December 2024', () => {
    const d = ruleSets.EU.scope.description
    expect(d).toMatch(/2011\/477\/EU/)
    expect(d).toMatch(/2014\/531\/EU/)
    expect(d).toMatch(/\(EU\) 2023\/988 replaced Directive 2001\/95\/EC/)
    expect(d).toMatch(/13 December 2024/)
  })
})
