import { describe, expect, it } from 'vitest'
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

  it('a cordless roller has no cords at all: not_applicable', () => {
    expect(check(usStockBase, { control: 'cordless' }).verdict).toBe('not_applicable')
  })

  it('a cordless venetian still has inner cords: the inner-cord and label clauses apply (16 CFR 1120.3(e)/(f))', () => {
    const r = check(usStockBase, { control: 'cordless', productType: 'venetian', innerCordStops: true })
    expect(r.verdict).toBe('compliant')
    expect(r.findings.find(f => f.clause === 'us.inner-cords')!.verdict).toBe('pass')
    expect(check(usStockBase, { control: 'cordless', productType: 'venetian', innerCordStops: false }).verdict).toBe('non_compliant')
  })
})

describe('us.stock-operating-cords — 16 CFR 1120.3(e), A100.1-2018 §4.3.1: short cord ≤ 8 in (203 mm)', () => {
  it('203 mm passes, 204 mm fails', () => {
    expect(clause('us.stock-operating-cords', usStockBase, { operatingCordLengthMm: 203 })).toMatchObject({ verdict: 'pass', limit: 203 })
    const f = clause('us.stock-operating-cords', usStockBase, { operatingCordLengthMm: 204 })
    expect(f).toMatchObject({ verdict: 'fail', measured: 204, limit: 203, unit: 'mm', field: 'operatingCordLengthMm', basis: 'published' })
    expect(f.fix).toMatch(/cordless/)
  })

  it('203.2 mm (exactly 8 in) fails: 203 mm is the stricter rounding (16 CFR 1120.3(e))', () => {
    expect(clause('us.stock-operating-cords', usStockBase, { operatingCordLengthMm: 203.2 }).verdict).toBe('fail')
  })

  it('a stock chain loop is judged by the loop it forms (16 CFR 1120.3(e))', () => {
    const loop = { control: 'chain_loop' as const, operatingCordLengthMm: null, freeCordLengthMm: null }
    expect(clause('us.stock-operating-cords', usStockBase, { ...loop, loopPullOutMm: 300 }).verdict).toBe('fail')
    expect(clause('us.stock-operating-cords', usStockBase, { ...loop, loopPullOutMm: 200 }).verdict).toBe('pass')
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

  it('does not cover custom products; unknown stock/custom is missing madeTo (A100.1-2018 definitions via 16 CFR 1260.1)', () => {
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

describe('A100.1-2022 for custom products made from 1 June 2024 (WCMA/WCSC FAQ, published)', () => {
  it('us.custom-2022-no-free-cords: a free-hanging operating cord fails from 1 June 2024, not before', () => {
    const free = { madeTo: 'custom' as const, control: 'free_cord' as const, installedOn: null }
    expect(clause('us.custom-2022-no-free-cords', usStockBase, { ...free, manufacturedOn: '2024-06-01' })).toMatchObject({ verdict: 'fail', field: 'control' })
    expect(clause('us.custom-2022-no-free-cords', usStockBase, { ...free, manufacturedOn: '2024-05-31' }).verdict).toBe('not_applicable')
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
