import { describe, expect, it } from 'vitest'
import { ruleSets } from '../../../rules'
import { check, clause, usCustomLoopBase, usStockBase } from './fixtures'

// Sources: 16 CFR 1120.3(e)/(f) making ANSI/WCMA A100.1-2018 §4.3.1 mandatory (87 FR 72873); A100.1-2018 custom
// provisions (CPSC guidance, secondary); A100.1-2022 via the WCMA/WCSC FAQ; 16 CFR 1260 (87 FR 73144), vacated.

describe('US rule set as a whole', () => {
  it('a stock product with a 150 mm cord and a label is compliant (16 CFR 1120.3(e))', () => {
    expect(check(usStockBase).verdict).toBe('compliant')
  })

  it('a custom 2025 chain loop with its tension device is compliant (A100.1-2022, WCMA/WCSC FAQ)', () => {
    expect(check(usCustomLoopBase).verdict).toBe('compliant')
  })

  it('a cordless roller is judged on its maker\'s label alone: every finished window covering carries one (CPSC 15(j) business guidance; 16 CFR 1120.3(e))', () => {
    expect(check(usStockBase, { control: 'cordless' }).verdict).toBe('compliant')
    expect(check(usStockBase, { control: 'cordless', manufacturerLabel: false }).verdict).toBe('non_compliant')
  })

  it('a cordless venetian still has inner cords: the inner-cord and label clauses apply (16 CFR 1120.3(e)/(f))', () => {
    const r = check(usStockBase, { control: 'cordless', productType: 'venetian', innerCordStops: true })
    expect(r.verdict).toBe('compliant')
    expect(r.findings.find(f => f.clause === 'us.inner-cords')!.verdict).toBe('pass')
    expect(check(usStockBase, { control: 'cordless', productType: 'venetian', innerCordStops: false }).verdict).toBe('non_compliant')
  })
})

describe('us.stock-operating-cords — 16 CFR 1120.3(e), A100.1-2018 §4.3.1: short cord of 8 in or less (203.2 mm)', () => {
  it('the threshold is kept in inches: 8 in (CPSC 15(j) FAQ, §4.3.1.2 "equal to or less than 8 inches")', () => {
    expect(ruleSets.US.clauses.find(c => c.id === 'us.stock-operating-cords')!.thresholds).toEqual([expect.objectContaining({ name: 'shortCordMaxIn', value: 8, unit: 'in' })])
  })

  it('exactly 8 in (203.2 mm) passes, 203.3 mm fails (§4.3.1.2: "8 inches or less"; 1 in = 25.4 mm)', () => {
    expect(clause('us.stock-operating-cords', usStockBase, { operatingCordLengthMm: 203.2 })).toMatchObject({ verdict: 'pass', limit: 203.2, unit: 'mm' })
    const f = clause('us.stock-operating-cords', usStockBase, { operatingCordLengthMm: 203.3 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 203.3, limit: 203.2, unit: 'mm', field: 'operatingCordLengthMm', basis: 'published' })
    expect(f.fix).toMatch(/cordless/)
  })

  it('a stock continuous loop is never a short cord: a taut 15 mm pull-out still fails unless the loop is inaccessible (A100.1-2018 §4.3.1)', () => {
    const loop = { control: 'chain_loop' as const, operatingCordLengthMm: null, freeCordLengthMm: null, loopPullOutMm: 15, loopPerimeterMm: 300 }
    expect(clause('us.stock-operating-cords', usStockBase, { ...loop, operatingCordsInaccessible: false })).toMatchObject({ verdict: 'fail', field: 'operatingCordsInaccessible' })
    expect(clause('us.stock-operating-cords', usStockBase, loop)).toMatchObject({ verdict: 'missing', field: 'operatingCordsInaccessible' })
    expect(clause('us.stock-operating-cords', usStockBase, { ...loop, operatingCordsInaccessible: true }).verdict).toBe('pass')
  })

  it('the longer cord decides: a 0 mm free cord does not hide a 600 mm operating cord, either way round', () => {
    expect(clause('us.stock-operating-cords', usStockBase, { freeCordLengthMm: 0, operatingCordLengthMm: 600 })).toMatchObject({ verdict: 'fail', measured: 600 })
    expect(clause('us.stock-operating-cords', usStockBase, { freeCordLengthMm: 600, operatingCordLengthMm: 0 })).toMatchObject({ verdict: 'fail', measured: 600, field: 'freeCordLengthMm' })
  })

  it('cites the in-force definition of stock, 16 CFR 1120.2(f), not the vacated 1260.1', () => {
    const c = ruleSets.US.clauses.find(x => x.id === 'us.stock-operating-cords')!
    expect(c.note).toMatch(/1120\.2\(f\)/)
    expect(c.note).not.toMatch(/1260/)
  })

  it('an unmeasured cord is missing operatingCordLengthMm', () => {
    expect(clause('us.stock-operating-cords', usStockBase, { operatingCordLengthMm: null, freeCordLengthMm: null })).toMatchObject({
      verdict: 'missing',
      field: 'operatingCordLengthMm',
    })
  })

  it('binds products made from 28 Dec 2022: 27 Dec is not covered, 28 Dec is, and "2022-12" counts as covered (16 CFR 1120; stricter reading)', () => {
    const long = { operatingCordLengthMm: 500 }
    expect(clause('us.stock-operating-cords', usStockBase, { ...long, manufacturedOn: '2022-12-27', installedOn: null }).verdict).toBe('not_applicable')
    expect(clause('us.stock-operating-cords', usStockBase, { ...long, manufacturedOn: '2022-12-28', installedOn: null }).verdict).toBe('fail')
    expect(clause('us.stock-operating-cords', usStockBase, { ...long, manufacturedOn: '2022-12', installedOn: null }).verdict).toBe('fail')
    expect(clause('us.stock-operating-cords', usStockBase, { ...long, manufacturedOn: '2022-11', installedOn: null }).verdict).toBe('not_applicable')
  })

  it('does not cover custom products; unknown stock/custom is missing madeTo (A100.1-2018 definitions via 16 CFR 1120.2)', () => {
    expect(clause('us.stock-operating-cords', usStockBase, { madeTo: 'custom' }).verdict).toBe('not_applicable')
    expect(clause('us.stock-operating-cords', usStockBase, { madeTo: null })).toMatchObject({ verdict: 'missing', field: 'madeTo' })
  })
})

describe('us.inner-cords — 16 CFR 1120.3(e)/(f): inner cords inaccessible or unable to form a loop', () => {
  const venetian = { productType: 'venetian' as const, control: 'wand' as const }

  it('stops pass, no stops fail, unknown is missing, unreachable cords pass', () => {
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordStops: true }).verdict).toBe('pass')
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordStops: false })).toMatchObject({ verdict: 'fail', field: 'innerCordStops' })
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordStops: null })).toMatchObject({ verdict: 'missing', field: 'innerCordStops' })
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordStops: false, innerCordsReachable: false }).verdict).toBe('pass')
  })

  it('covers custom products too, and not rollers', () => {
    expect(clause('us.inner-cords', usCustomLoopBase, { productType: 'roman', innerCordStops: false }).verdict).toBe('fail')
    expect(clause('us.inner-cords', usStockBase).verdict).toBe('not_applicable')
  })
})

describe('us.maker-label — 16 CFR 1120.3(e)/(f): permanent label with month and year of manufacture', () => {
  it('true passes, false fails (substantial hazard), null is missing', () => {
    expect(clause('us.maker-label', usStockBase, { manufacturerLabel: true }).verdict).toBe('pass')
    const f = clause('us.maker-label', usStockBase, { manufacturerLabel: false })
    expect(f).toMatchObject({ verdict: 'fail', field: 'manufacturerLabel' })
    expect(f.message).toMatch(/substantial product hazard/)
    expect(clause('us.maker-label', usStockBase, { manufacturerLabel: null }).verdict).toBe('missing')
  })
})

describe('us.custom-2018-cord-length — A100.1-2018 (secondary): custom cords default to 40 % of product height', () => {
  const custom = { madeTo: 'custom' as const, manufacturedOn: '2023-01', installedOn: '2023-02-01', productHeightMm: 1000 }

  it('400 mm on a 1000 mm product passes, 401 mm fails when no longer cord was asked for', () => {
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, operatingCordLengthMm: 400 })).toMatchObject({ verdict: 'pass', limit: 400 })
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, operatingCordLengthMm: 401, longerCordRequested: false })).toMatchObject({
      verdict: 'fail',
      measured: 401,
      limit: 400,
    })
  })

  it('longer on request passes; request not recorded is missing longerCordRequested', () => {
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, operatingCordLengthMm: 401, longerCordRequested: true }).verdict).toBe('pass')
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, operatingCordLengthMm: 401 })).toMatchObject({
      verdict: 'missing',
      field: 'longerCordRequested',
    })
  })

  it('product height not recorded is missing productHeightMm', () => {
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, productHeightMm: null })).toMatchObject({ verdict: 'missing', field: 'productHeightMm' })
  })

  it('made 31 May 2024 falls under 2018, 1 June 2024 under 2022 (WCMA/WCSC FAQ)', () => {
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, manufacturedOn: '2024-05-31', installedOn: null, operatingCordLengthMm: 300 }).verdict).toBe('pass')
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, manufacturedOn: '2024-06-01', installedOn: null }).verdict).toBe('not_applicable')
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, manufacturedOn: '2024-06', installedOn: null }).verdict).toBe('not_applicable')
  })
})

describe('us.custom-2018-loop-tension — A100.1-2018 (secondary): custom continuous loops need a tension device', () => {
  const y2023 = { manufacturedOn: '2023-04', installedOn: '2023-05-01' }
  it('with a device passes, without fails, unknown is missing', () => {
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...y2023, tensionDevice: true }).verdict).toBe('pass')
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...y2023, tensionDevice: false })).toMatchObject({ verdict: 'fail', field: 'tensionDevice' })
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...y2023, tensionDevice: null }).verdict).toBe('missing')
  })
})

describe('A100.1-2022 for custom products made from 1 June 2024 (WCMA/WCSC FAQ and trade summaries, secondary)', () => {
  it('us.custom-2022-no-free-cords: a free-hanging operating cord fails from 1 June 2024, not before; a short static cord of 8 in (203.2 mm) or less is not free-hanging', () => {
    const free = { madeTo: 'custom' as const, control: 'free_cord' as const, installedOn: null, freeCordLengthMm: 600, operatingCordLengthMm: 600 }
    expect(clause('us.custom-2022-no-free-cords', usStockBase, { ...free, manufacturedOn: '2024-06-01' })).toMatchObject({ verdict: 'fail', measured: 600, limit: 203.2 })
    expect(clause('us.custom-2022-no-free-cords', usStockBase, { ...free, manufacturedOn: '2024-05-31' }).verdict).toBe('not_applicable')
    const short = { ...free, manufacturedOn: '2024-06-01', freeCordLengthMm: 203.2, operatingCordLengthMm: null }
    expect(clause('us.custom-2022-no-free-cords', usStockBase, short)).toMatchObject({ verdict: 'pass', measured: 203.2 })
    expect(clause('us.custom-2022-no-free-cords', usStockBase, { ...short, freeCordLengthMm: 203.3 }).verdict).toBe('fail')
    expect(clause('us.custom-2022-no-free-cords', usStockBase, { ...short, freeCordLengthMm: null })).toMatchObject({ verdict: 'missing', field: 'freeCordLengthMm' })
  })

  it('us.custom-2022-slatted-loops: a bead chain on a custom venetian fails; on a roller it does not apply', () => {
    expect(clause('us.custom-2022-slatted-loops', usCustomLoopBase, { productType: 'venetian', innerCordStops: true }).verdict).toBe('fail')
    expect(clause('us.custom-2022-slatted-loops', usCustomLoopBase).verdict).toBe('not_applicable')
    expect(clause('us.custom-2022-slatted-loops', usCustomLoopBase, { productType: 'venetian', manufacturedOn: '2024-05-31', installedOn: null }).verdict).toBe(
      'not_applicable',
    )
  })

  it('us.custom-2022-loop-tension: with its device passes, without fails, unknown is missing', () => {
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase).verdict).toBe('pass')
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase, { tensionDevice: false }).verdict).toBe('fail')
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase, { tensionDevice: null }).verdict).toBe('missing')
  })

  it('us.custom-2022-loop-tension: the device must be factory-fitted and the product must not work without it', () => {
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase, { tensionDeviceFactoryFitted: false })).toMatchObject({ verdict: 'fail', field: 'tensionDeviceFactoryFitted' })
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase, { operatesWithoutTensionDevice: true })).toMatchObject({ verdict: 'fail', field: 'operatesWithoutTensionDevice' })
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase, { tensionDeviceFactoryFitted: null })).toMatchObject({ verdict: 'missing', field: 'tensionDeviceFactoryFitted' })
    expect(clause('us.custom-2022-loop-tension', usCustomLoopBase, { operatesWithoutTensionDevice: null })).toMatchObject({ verdict: 'missing', field: 'operatesWithoutTensionDevice' })
  })

  it('us.custom-2022-tilt-cords: a free-hanging tilt cord on a custom venetian made from 1 June 2024 fails; a wand passes', () => {
    const venetian = { productType: 'venetian' as const, control: 'cordless' as const, innerCordStops: true }
    expect(clause('us.custom-2022-tilt-cords', usCustomLoopBase, { ...venetian, freeTiltCord: true })).toMatchObject({ verdict: 'fail', field: 'freeTiltCord', basis: 'secondary' })
    expect(clause('us.custom-2022-tilt-cords', usCustomLoopBase, { ...venetian, freeTiltCord: false }).verdict).toBe('pass')
    expect(clause('us.custom-2022-tilt-cords', usCustomLoopBase, { ...venetian, freeTiltCord: null }).verdict).toBe('missing')
    expect(clause('us.custom-2022-tilt-cords', usCustomLoopBase, { ...venetian, freeTiltCord: true, manufacturedOn: '2024-05-31', installedOn: null }).verdict).toBe('not_applicable')
  })

  it('us.custom-2022-multi-cord-connectors: several operating cords joined in one connector fail (recalled: basis memory)', () => {
    const cords = { control: 'cord_loop' as const }
    expect(clause('us.custom-2022-multi-cord-connectors', usCustomLoopBase, { ...cords, multiCordConnector: true })).toMatchObject({ verdict: 'fail', basis: 'memory' })
    expect(clause('us.custom-2022-multi-cord-connectors', usCustomLoopBase, { ...cords, multiCordConnector: false }).verdict).toBe('pass')
    expect(clause('us.custom-2022-multi-cord-connectors', usCustomLoopBase).verdict).toBe('not_applicable')
  })

  it('the 2022 edition rests on a trade association\'s summary: basis secondary, not published', () => {
    for (const c of ruleSets.US.clauses.filter(x => x.id.startsWith('us.custom-2022'))) expect(['secondary', 'memory'], c.id).toContain(c.basis)
  })

  it('an unrecorded manufacture date is checked as if made today: the 2022 edition (stricter)', () => {
    const f = clause('us.custom-2022-loop-tension', usCustomLoopBase, { tensionDevice: false, manufacturedOn: null, installedOn: null })
    expect(f.verdict).toBe('fail')
    expect(f.message).toMatch(/manufacturedOn not recorded/)
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { manufacturedOn: null, installedOn: null }).verdict).toBe('not_applicable')
  })
})

describe('us.cfr-1260-withdrawn — 16 CFR 1260, vacated 12 Sep 2023 (D.C. Cir. No. 22-1300)', () => {
  it('is history: always not_applicable with the vacatur noted, and never decides the verdict', () => {
    for (const changes of [{}, { tensionDevice: false }, { control: 'free_cord' as const }]) {
      const f = clause('us.cfr-1260-withdrawn', usCustomLoopBase, changes)
      expect(f.verdict).toBe('not_applicable')
      expect(f.message).toMatch(/vacated on 12 September 2023/)
    }
    expect(check(usCustomLoopBase).verdict).toBe('compliant')
  })
})

describe('us.inner-cords — stops do not excuse a hazardous inner loop (16 CFR 1120.3(e)/(f); A100.1-2018 Appendices C and D)', () => {
  const venetian = { productType: 'venetian' as const, control: 'wand' as const, innerCordStops: true }

  it('stops fitted but a hazardous inner loop recorded fails; no loop passes; unreachable passes', () => {
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordLoop: true })).toMatchObject({ verdict: 'fail', field: 'innerCordLoop' })
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordLoop: false })).toMatchObject({ verdict: 'pass', field: 'innerCordLoop' })
    expect(clause('us.inner-cords', usStockBase, { ...venetian, innerCordLoop: true, innerCordsReachable: false }).verdict).toBe('pass')
  })
})

describe('us.maker-label on every finished window covering (CPSC 15(j) business guidance: "all finished window coverings")', () => {
  it.each(['cordless', 'motorised', 'wand'] as const)('a %s roller needs the label: null is missing, false fails', (control) => {
    expect(clause('us.maker-label', usStockBase, { control, manufacturerLabel: null })).toMatchObject({ verdict: 'missing', field: 'manufacturerLabel' })
    expect(clause('us.maker-label', usStockBase, { control, manufacturerLabel: false }).verdict).toBe('fail')
  })
})

describe('the longer cord decides on custom 2018 products (A100.1-2018, secondary)', () => {
  it('a 0 mm free cord does not hide a 600 mm operating cord on a 1000 mm product (40 % = 400 mm)', () => {
    const custom = { madeTo: 'custom' as const, manufacturedOn: '2023-01', installedOn: '2023-02-01', productHeightMm: 1000, longerCordRequested: false }
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, freeCordLengthMm: 0, operatingCordLengthMm: 600 })).toMatchObject({ verdict: 'fail', measured: 600 })
    expect(clause('us.custom-2018-cord-length', usStockBase, { ...custom, freeCordLengthMm: 600, operatingCordLengthMm: 0 })).toMatchObject({ verdict: 'fail', measured: 600 })
  })
})

describe('A100.1-2018 clauses reach only products made from 15 December 2018 (WCMA: effective 15 Dec 2018, secondary)', () => {
  it('custom loops made 14 Dec 2018 are outside, 15 Dec 2018 inside; "2018-12" counts as inside (stricter)', () => {
    const noDevice = { tensionDevice: false, installedOn: null }
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...noDevice, manufacturedOn: '2018-12-14' }).verdict).toBe('not_applicable')
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...noDevice, manufacturedOn: '2018-12-15' }).verdict).toBe('fail')
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...noDevice, manufacturedOn: '2018-12' }).verdict).toBe('fail')
    expect(clause('us.custom-2018-loop-tension', usCustomLoopBase, { ...noDevice, manufacturedOn: '2017-06' }).verdict).toBe('not_applicable')
  })
})

describe('US warning label and tag (A100.1, recalled: basis memory)', () => {
  it.each([
    ['us.warning-label', 'warningLabel'],
    ['us.warning-tag', 'swingTag'],
  ] as const)('%s: true passes, false fails, null is missing', (id, field) => {
    expect(clause(id, usStockBase, { [field]: true })).toMatchObject({ verdict: 'pass', basis: 'memory' })
    expect(clause(id, usStockBase, { [field]: false })).toMatchObject({ verdict: 'fail', field })
    expect(clause(id, usStockBase, { [field]: null })).toMatchObject({ verdict: 'missing', field })
  })
})
