import { describe, expect, it } from 'vitest'
import { ruleSets } from '../../../rules'
import { auBase, check, clause } from './fixtures'

// Sources: Competition and Consumer (Corded Internal Window Coverings) Safety Standard 2014 (SS2014);
// ACCC installation guide (Nov 2014); NSW Government "Blind and curtain safety"; supply Regulations 2010.

describe('AU rule set as a whole', () => {
  it('a tensioned chain loop with every label passes (SS2014 s 6(1)(a); ACCC guide)', () => {
    const r = check(auBase)
    expect(r.verdict).toBe('compliant')
    expect(r.rulesVersion).toMatch(/^AU-\d{4}\.\d+\.\d+$/)
  })

  it('a wand-operated covering has no cords: not_applicable (SS2014 s 6(1)(a) covers cords and chains)', () => {
    const r = check(auBase, { control: 'wand' })
    expect(r.verdict).toBe('not_applicable')
    expect(r.findings.filter(f => f.verdict !== 'not_applicable' && f.verdict !== 'advice')).toEqual([])
  })
})

describe('au.loop-reach — SS2014 s 6(1)(a): no loop of 220 mm or longer within 1600 mm of the floor', () => {
  const low = { tensionDevice: false, lowestCordPointMm: 1000 }

  it('219 mm loop passes, 220 mm fails (SS2014 s 6(1)(a), "220 mm or longer")', () => {
    expect(clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 219 }).verdict).toBe('pass')
    const f = clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 220 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 220, limit: 220, unit: 'mm', field: 'loopPullOutMm', basis: 'published' })
    expect(f.fix).toMatch(/tension device/)
  })

  it('lowest point at 1600 mm is inside the zone, 1601 mm is outside (SS2014 s 6(1)(a); stricter reading of "at or less than 1,600 mm")', () => {
    expect(clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 400, lowestCordPointMm: 1600 }).verdict).toBe('fail')
    const f = clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 400, lowestCordPointMm: 1601 })
    expect(f).toMatchObject({ verdict: 'pass', measured: 1601, limit: 1600, field: 'lowestCordPointMm' })
  })

  it('a perimeter is not a pull-out: without a pull-out, 438 mm round bounds the loop to 219 mm and passes; 440 mm asks for the pull-out, never fails (SS2014 s 6(1)(a), the loop a child can form)', () => {
    expect(clause('au.loop-reach', auBase, { ...low, loopPullOutMm: null, loopPerimeterMm: 438 })).toMatchObject({ verdict: 'pass', field: 'loopPerimeterMm', measured: 219 })
    expect(clause('au.loop-reach', auBase, { ...low, loopPullOutMm: null, loopPerimeterMm: 440 })).toMatchObject({ verdict: 'missing', field: 'loopPullOutMm' })
  })

  it('a correctly tensioned chain passes on its pull-out whatever its perimeter: 1200 mm round, 219 mm pull-out passes, 220 mm fails (SS2014 s 6(1)(a))', () => {
    const tensioned = { lowestCordPointMm: 300, tensionDeviceHeightMm: 300, loopPerimeterMm: 1200 }
    expect(clause('au.loop-reach', auBase, { ...tensioned, loopPullOutMm: 219 })).toMatchObject({ verdict: 'pass', field: 'loopPullOutMm', measured: 219 })
    expect(clause('au.loop-reach', auBase, { ...tensioned, loopPullOutMm: 220 })).toMatchObject({ verdict: 'fail', field: 'loopPullOutMm', measured: 220 })
    expect(check(auBase, { ...tensioned, loopPullOutMm: 15 }).verdict).toBe('compliant')
  })

  it('an unmeasured loop in the zone is missing loopPullOutMm (SS2014 s 6(1)(a))', () => {
    const f = clause('au.loop-reach', auBase, { ...low, loopPullOutMm: null })
    expect(f).toMatchObject({ verdict: 'missing', field: 'loopPullOutMm', limit: 220 })
    expect(check(auBase, { ...low, loopPullOutMm: null }).verdict).toBe('incomplete')
  })

  it('a long loop of unknown height is missing lowestCordPointMm, unless the headrail itself is in the zone (SS2014 s 6(1)(a))', () => {
    expect(clause('au.loop-reach', auBase, { tensionDevice: false, lowestCordPointMm: null, loopPullOutMm: 300 })).toMatchObject({
      verdict: 'missing',
      field: 'lowestCordPointMm',
    })
    expect(clause('au.loop-reach', auBase, { tensionDevice: false, lowestCordPointMm: null, headHeightMm: 1600, loopPullOutMm: 300 }).verdict).toBe('fail')
    expect(clause('au.loop-reach', auBase, { tensionDevice: false, lowestCordPointMm: null, headHeightMm: 1601, loopPullOutMm: 300 }).verdict).toBe('missing')
  })

  it('a loop held taut by a passing tension device is fine below 1600 mm (SS2014 s 6(1)(a); ACCC guide)', () => {
    const r = check(auBase, { lowestCordPointMm: 300, loopPullOutMm: 15, tensionDeviceHeightMm: 300 })
    expect(r.verdict).toBe('compliant')
  })

  it('a tension device that leaves a 220 mm loop free still fails, and says to tighten it (SS2014 s 6(1)(a))', () => {
    const f = clause('au.loop-reach', auBase, { loopPullOutMm: 250 })
    expect(f.verdict).toBe('fail')
    expect(f.fix).toMatch(/Tighten/)
  })

  it('applies to free cords too (SS2014 s 6(1)(a): "loose cord or chain")', () => {
    expect(clause('au.loop-reach', auBase, { control: 'free_cord', tensionDevice: false, loopPullOutMm: 300, cleat: true, cleatHeightMm: 1700 }).verdict).toBe('fail')
  })

  it('installed 31 Dec 2014 is not covered, 1 Jan 2015 is (SS2014: not retrospective, applies from 1 January 2015)', () => {
    const before = clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 400, installedOn: '2014-12-31', manufacturedOn: '2014-06' })
    expect(before.verdict).toBe('not_applicable')
    expect(before.message).toMatch(/not retrospective/)
    expect(clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 400, installedOn: '2015-01-01', manufacturedOn: '2014-06' }).verdict).toBe('fail')
  })

  it('an unrecorded installation date is checked as if installed today, and says so (SS2014; stricter reading)', () => {
    const f = clause('au.loop-reach', auBase, { ...low, loopPullOutMm: 400, installedOn: null })
    expect(f.verdict).toBe('fail')
    expect(f.message).toMatch(/installedOn not recorded: checked as if it were 2026-12-01/)
  })
})

describe('au.tension-device — ACCC guide: devices fixed lower than 1600 mm hold 70 N for 10 s and keep the cord', () => {
  it('70 N passes, 69.9 N fails (ACCC guide, 70 N in any direction for 10 s)', () => {
    expect(clause('au.tension-device', auBase, { tensionDeviceHoldN: 70 })).toMatchObject({ verdict: 'pass', measured: 70, limit: 70, unit: 'N' })
    const f = clause('au.tension-device', auBase, { tensionDeviceHoldN: 69.9 })
    expect(f).toMatchObject({ verdict: 'fail', field: 'tensionDeviceHoldN', measured: 69.9, limit: 70 })
    expect(f.fix).toMatch(/screws into timber/)
  })

  it('a device at 1600 mm with no pull-test figure is missing tensionDeviceHoldN; at 1601 mm none is needed (ACCC guide; stricter reading of 1600 mm)', () => {
    expect(clause('au.tension-device', auBase, { tensionDeviceHeightMm: 1600, tensionDeviceHoldN: null })).toMatchObject({
      verdict: 'missing',
      field: 'tensionDeviceHoldN',
      limit: 70,
    })
    expect(clause('au.tension-device', auBase, { tensionDeviceHeightMm: 1601, tensionDeviceHoldN: null }).verdict).toBe('pass')
    expect(check(auBase, { tensionDeviceHeightMm: 1000, tensionDeviceHoldN: null }).verdict).toBe('incomplete')
  })

  it('a cord a child can take out fails; not recorded is missing (ACCC guide)', () => {
    expect(clause('au.tension-device', auBase, { tensionDeviceTamperProof: false })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceTamperProof' })
    expect(clause('au.tension-device', auBase, { tensionDeviceTamperProof: null })).toMatchObject({ verdict: 'missing', field: 'tensionDeviceTamperProof' })
  })

  it('an unrecorded device height with no pull test is missing tensionDeviceHeightMm (ACCC guide)', () => {
    expect(clause('au.tension-device', auBase, { tensionDeviceHeightMm: null, tensionDeviceHoldN: null })).toMatchObject({
      verdict: 'missing',
      field: 'tensionDeviceHeightMm',
    })
  })

  it('no device: not applicable; unknown device on a long low loop: missing; on a short loop: not applicable (ACCC guide)', () => {
    expect(clause('au.tension-device', auBase, { tensionDevice: false }).verdict).toBe('not_applicable')
    expect(clause('au.tension-device', auBase, { tensionDevice: null, loopPullOutMm: 300 })).toMatchObject({ verdict: 'missing', field: 'tensionDevice' })
    expect(clause('au.tension-device', auBase, { tensionDevice: null, loopPullOutMm: 219 }).verdict).toBe('not_applicable')
    expect(clause('au.tension-device', auBase, { tensionDevice: null, loopPullOutMm: 300, lowestCordPointMm: 1601 }).verdict).toBe('not_applicable')
  })

  it('covers cord guides on free cords too: at 1000 mm, 69.9 N fails and 70 N passes (ACCC guide; SS2014 cord guides lower than 1600 mm)', () => {
    const freeGuide = { control: 'free_cord' as const, cleat: false, tensionDeviceHeightMm: 1000, loopPullOutMm: 0 }
    expect(clause('au.tension-device', auBase, { ...freeGuide, tensionDeviceHoldN: 69.9 })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceHoldN', limit: 70 })
    expect(clause('au.tension-device', auBase, { ...freeGuide, tensionDeviceHoldN: 70 })).toMatchObject({ verdict: 'pass', limit: 70 })
    expect(check(auBase, { ...freeGuide, tensionDeviceHoldN: 40 }).verdict).toBe('non_compliant')
  })

  it('a free-cord guide a child can take the cord out of fails; not recorded is missing (ACCC guide)', () => {
    const freeGuide = { control: 'free_cord' as const, cleat: false, tensionDeviceHeightMm: 1000, loopPullOutMm: 0 }
    expect(clause('au.tension-device', auBase, { ...freeGuide, tensionDeviceTamperProof: false })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceTamperProof' })
    expect(clause('au.tension-device', auBase, { ...freeGuide, tensionDeviceTamperProof: null })).toMatchObject({ verdict: 'missing', field: 'tensionDeviceTamperProof' })
  })

  it('a guide below 1600 mm must hold the cord so no 220 mm loop forms: 219 mm passes, 220 mm fails, unmeasured is missing (ACCC guide; SS2014)', () => {
    expect(clause('au.tension-device', auBase, { loopPullOutMm: 219 }).verdict).toBe('pass')
    expect(clause('au.tension-device', auBase, { loopPullOutMm: 220 })).toMatchObject({ verdict: 'fail', field: 'loopPullOutMm', limit: 220 })
    expect(clause('au.tension-device', auBase, { loopPullOutMm: null })).toMatchObject({ verdict: 'missing', field: 'loopPullOutMm' })
  })
})

describe('au.cleat-height — SS2014 cleats (as restated by the ACCC guide): a cleat securing a cord is at least 1600 mm up', () => {
  const corded = { control: 'free_cord' as const, tensionDevice: false, loopPullOutMm: 100, cleat: true }

  it('1600 mm passes, 1599 mm fails', () => {
    expect(clause('au.cleat-height', auBase, { ...corded, cleatHeightMm: 1600 })).toMatchObject({ verdict: 'pass', limit: 1600 })
    const f = clause('au.cleat-height', auBase, { ...corded, cleatHeightMm: 1599 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 1599, limit: 1600, field: 'cleatHeightMm' })
    expect(f.fix).toMatch(/1600 mm/)
  })

  it('a cleat of unknown height is missing; no cleat is not applicable; unknown on a free cord is missing', () => {
    expect(clause('au.cleat-height', auBase, { ...corded, cleatHeightMm: null })).toMatchObject({ verdict: 'missing', field: 'cleatHeightMm' })
    expect(clause('au.cleat-height', auBase, { ...corded, cleat: false }).verdict).toBe('not_applicable')
    expect(clause('au.cleat-height', auBase, { ...corded, cleat: null })).toMatchObject({ verdict: 'missing', field: 'cleat' })
    expect(clause('au.cleat-height', auBase, { cleat: null }).verdict).toBe('not_applicable')
    expect(clause('au.cleat-height', auBase, { control: 'cord_loop', cleat: null }).verdict).toBe('not_applicable')
  })
})

describe('labels — SS2014 installer\'s label and labels kept (restated by the ACCC guide, NSW Government); supply Regulations 2010', () => {
  it.each([
    ['au.installer-label', 'installerLabel'],
    ['au.warning-label-kept', 'warningLabel'],
    ['au.swing-tag-kept', 'swingTag'],
    ['au.supply-swing-tag', 'swingTag'],
  ] as const)('%s: true passes, false fails, null is missing (NSW summary / Regulations 2010)', (id, field) => {
    expect(clause(id, auBase, { [field]: true }).verdict).toBe('pass')
    expect(clause(id, auBase, { [field]: false })).toMatchObject({ verdict: 'fail', field, measured: false, limit: true })
    expect(clause(id, auBase, { [field]: null })).toMatchObject({ verdict: 'missing', field })
  })

  it('installation labels do not bind installations before 2015 (SS2014, not retrospective)', () => {
    expect(clause('au.installer-label', auBase, { installerLabel: false, installedOn: '2014-12-31', manufacturedOn: '2014-01' }).verdict).toBe('not_applicable')
  })

  it('supply labelling binds products supplied after 30 December 2010 (Regulations 2010)', () => {
    const old = { swingTag: false, manufacturedOn: '2010-06', installedOn: '2010-12-30' }
    expect(clause('au.supply-swing-tag', auBase, old).verdict).toBe('not_applicable')
    expect(clause('au.supply-swing-tag', auBase, { ...old, installedOn: '2010-12-31' }).verdict).toBe('fail')
    expect(clause('au.supply-swing-tag', auBase, { ...old, installedOn: null, manufacturedOn: '2011-01' }).verdict).toBe('fail')
  })

  it('a 2012 installation is judged on supply labelling only, with advice to bring it up to date (Regulations 2010; SS2014 not retrospective)', () => {
    const r = check(auBase, { installedOn: '2012-05-01', manufacturedOn: '2012-01', tensionDevice: false, loopPullOutMm: 500, installerLabel: false })
    expect(r.verdict).toBe('compliant')
    const advice = r.findings.find(f => f.clause === 'au.older-installation')!
    expect(advice.verdict).toBe('advice')
    expect(advice.message).toMatch(/strangulation hazard/)
    expect(check(auBase).findings.find(f => f.clause === 'au.older-installation')!.verdict).toBe('not_applicable')
  })
})

describe('au.fixing-choice — ACCC guide, fixing options (advice)', () => {
  it('gives advice when a device or cleat is fitted and never changes the verdict', () => {
    expect(clause('au.fixing-choice', auBase).verdict).toBe('advice')
    expect(clause('au.fixing-choice', auBase, { tensionDevice: false, cleat: false }).verdict).toBe('not_applicable')
  })
})

describe('inner and rear cords are loose cords — SS2014 s 6(1)(a) "a loose cord"', () => {
  const roman = { productType: 'roman' as const, control: 'wand' as const, tensionDevice: false, lowestCordPointMm: 900 }

  it('a wand-operated roman blind whose rear cords pull out 220 mm at 900 mm fails; 219 mm passes', () => {
    expect(clause('au.loop-reach', auBase, { ...roman, innerLoopPullOutMm: 220 })).toMatchObject({ verdict: 'fail', field: 'innerLoopPullOutMm', measured: 220, limit: 220 })
    expect(clause('au.loop-reach', auBase, { ...roman, innerLoopPullOutMm: 219 })).toMatchObject({ verdict: 'pass', measured: 219 })
    expect(check(auBase, { ...roman, innerLoopPullOutMm: 300 }).verdict).toBe('non_compliant')
  })

  it('unmeasured inner cords are missing innerLoopPullOutMm; inner cords out of reach leave no loop to judge', () => {
    expect(clause('au.loop-reach', auBase, { ...roman, innerLoopPullOutMm: null })).toMatchObject({ verdict: 'missing', field: 'innerLoopPullOutMm' })
    expect(clause('au.loop-reach', auBase, { ...roman, innerLoopPullOutMm: null, innerCordsReachable: false }).verdict).toBe('not_applicable')
  })

  it('on a chain-operated venetian the longer of the two loops decides: a taut chain does not hide a 250 mm inner loop', () => {
    const f = clause('au.loop-reach', auBase, { productType: 'venetian', loopPullOutMm: 15, innerLoopPullOutMm: 250 })
    expect(f).toMatchObject({ verdict: 'fail', field: 'innerLoopPullOutMm', measured: 250 })
    expect(f.fix).toMatch(/inner cord stops/)
  })

  it('inner loops at or above 1601 mm are outside the zone (SS2014 s 6(1)(a))', () => {
    expect(clause('au.loop-reach', auBase, { ...roman, innerLoopPullOutMm: 400, lowestCordPointMm: 1601 }).verdict).toBe('pass')
  })
})

describe('au.installed-per-instructions — SS2014: installed as the retail packaging\'s instructions say (productsafety.gov.au)', () => {
  it('true passes, false fails, null is missing', () => {
    expect(clause('au.installed-per-instructions', auBase).verdict).toBe('pass')
    expect(clause('au.installed-per-instructions', auBase, { installedPerInstructions: false })).toMatchObject({ verdict: 'fail', field: 'installedPerInstructions' })
    expect(clause('au.installed-per-instructions', auBase, { installedPerInstructions: null })).toMatchObject({ verdict: 'missing', field: 'installedPerInstructions' })
  })
})

describe('AU scope — SS2014 binds installation supplied in trade or commerce (productsafety.gov.au; WA Consumer Protection)', () => {
  it('an occupier\'s own fitting is outside the installation clauses, but supply labelling (Regulations 2010) still applies', () => {
    const r = check(auBase, { installedByBusiness: false, tensionDevice: false, loopPullOutMm: 500, installerLabel: false, swingTag: false })
    for (const id of ['au.loop-reach', 'au.tension-device', 'au.cleat-height', 'au.installed-per-instructions', 'au.installer-label', 'au.warning-label-kept', 'au.swing-tag-kept']) {
      expect(r.findings.find(f => f.clause === id)!.verdict, id).toBe('not_applicable')
    }
    expect(r.findings.find(f => f.clause === 'au.supply-swing-tag')!.verdict).toBe('fail')
  })

  it('not recorded counts as installed by a business (stricter)', () => {
    expect(clause('au.loop-reach', auBase, { installedByBusiness: null, tensionDevice: false, loopPullOutMm: 500 }).verdict).toBe('fail')
  })

  it('cleat, guide, label and swing-tag clauses cite the 2014 Safety Standard itself, and the scope says what was found on premises', () => {
    for (const id of ['au.tension-device', 'au.cleat-height', 'au.installer-label', 'au.warning-label-kept', 'au.swing-tag-kept', 'au.installed-per-instructions']) {
      expect(clause(id, auBase).source, id).toMatch(/^Competition and Consumer \(Corded Internal Window Coverings\) Safety Standard 2014, /)
    }
    expect(ruleSets.AU.scope.description).toMatch(/every premises/)
    expect(ruleSets.AU.scope.description).toMatch(/trade or commerce/)
  })
})
