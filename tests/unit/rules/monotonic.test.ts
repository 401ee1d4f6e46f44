import { describe, expect, it } from 'vitest'
import { checkRecord, controlTypes, coveringRecordSchema, jurisdictions, premisesTypes, productTypes } from '../../../rules'
import type { CheckResult, CoveringRecord, OverallVerdict } from '../../../rules'
import { TODAY } from './fixtures'

// Properties over many generated records: making a cord reach lower, or a loop longer, never makes a covering
// look safer. Holds for every threshold in the rulebook (SS2014 s 6(1)(a), SOR/2019-97 s 7, 16 CFR 1120.3(e),
// EN 13120+A1 heights).

let seed = 20261201
function random(): number {
  seed = (seed + 0x6d2b79f5) | 0
  let t = Math.imul(seed ^ (seed >>> 15), 1 | seed)
  t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296
}
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(random() * xs.length)]!
const maybe = <T>(v: T): T | null => (random() < 0.15 ? null : v)
const mm = (lo: number, hi: number) => Math.round(lo + random() * (hi - lo))
const flag = () => maybe(random() < 0.5)

function generate(i: number): CoveringRecord {
  const head = mm(1200, 3000)
  const year = mm(2009, 2026)
  return coveringRecordSchema.parse({
    ref: `M-${i}`,
    jurisdiction: pick(jurisdictions),
    premises: pick(premisesTypes),
    installedOn: maybe(`${year}-12-31`),
    manufacturedOn: maybe(`${year}-${String(mm(1, 12)).padStart(2, '0')}`),
    madeTo: maybe(pick(['stock', 'custom'] as const)),
    productType: pick(productTypes),
    control: random() < 0.8 ? pick(['chain_loop', 'cord_loop', 'free_cord'] as const) : pick(controlTypes),
    headHeightMm: maybe(head),
    productHeightMm: maybe(mm(500, 2500)),
    lowestCordPointMm: maybe(mm(0, head)),
    loopPullOutMm: maybe(mm(0, 500)),
    loopPerimeterMm: maybe(mm(0, 1000)),
    freeCordLengthMm: maybe(mm(0, 1500)),
    operatingCordLengthMm: maybe(mm(0, 1500)),
    rearCordSpacingMm: maybe(mm(100, 300)),
    innerCordStops: flag(),
    tensionDevice: flag(),
    tensionDeviceHeightMm: maybe(mm(0, head)),
    tensionDeviceHoldN: maybe(mm(40, 100)),
    tensionDeviceTamperProof: flag(),
    cleat: flag(),
    cleatHeightMm: maybe(mm(1000, head)),
    breakaway: flag(),
    warningLabel: flag(),
    swingTag: flag(),
    installerLabel: flag(),
    manufacturerLabel: flag(),
    cordSpanMm: maybe(mm(50, 400)),
    jointFreeCordsMm: maybe(mm(0, 400)),
    innerCordsReachable: flag(),
    longerCordRequested: flag(),
    innerLoopPullOutMm: maybe(mm(0, 400)),
    innerCordLoop: flag(),
    operatingCordsInaccessible: flag(),
    tensionDeviceHoldsTaut: flag(),
    tensionDeviceFactoryFitted: flag(),
    operatesWithoutTensionDevice: flag(),
    freeTiltCord: flag(),
    multiCordConnector: flag(),
    installedPerInstructions: flag(),
    installedByBusiness: flag(),
    childFreePremisesWarning: flag(),
    bilingualInformation: flag(),
  })
}

const RANK: Record<OverallVerdict, number> = { not_applicable: 0, compliant: 0, incomplete: 1, non_compliant: 2 }
const records = Array.from({ length: 4000 }, (_, i) => generate(i))
const run = (r: CoveringRecord): CheckResult => checkRecord(r, { today: TODAY })

function expectNoSafer(before: CheckResult, after: CheckResult, what: string): void {
  expect(RANK[after.verdict], `${what}: ${before.ref} went from ${before.verdict} to ${after.verdict}`).toBeGreaterThanOrEqual(RANK[before.verdict])
  for (let i = 0; i < before.findings.length; i++) {
    if (before.findings[i]!.verdict === 'fail') {
      expect(after.findings[i]!.verdict, `${what}: ${before.findings[i]!.clause} on ${before.ref}`).toBe('fail')
    }
  }
}

describe('monotonic properties over 4000 generated records', () => {
  it('the generator covers every verdict', () => {
    const seen = new Set(records.map(r => run(r).verdict))
    expect([...seen].sort()).toEqual(['compliant', 'incomplete', 'non_compliant', 'not_applicable'])
  })

  it('a lower lowest cord point never turns non_compliant into compliant, nor a fail into anything else', () => {
    let compared = 0
    for (const r of records) {
      if (r.lowestCordPointMm === null || r.lowestCordPointMm === 0) continue
      for (const lower of [r.lowestCordPointMm - 1, Math.floor(r.lowestCordPointMm / 2), 0]) {
        expectNoSafer(run(r), run({ ...r, lowestCordPointMm: lower }), `lowest ${r.lowestCordPointMm} → ${lower}`)
        compared++
      }
    }
    expect(compared).toBeGreaterThan(5000)
  })

  it('a longer pulled-out loop (or larger perimeter) never turns non_compliant into compliant, nor a fail into anything else', () => {
    let compared = 0
    for (const r of records) {
      if (r.loopPullOutMm !== null) {
        for (const longer of [r.loopPullOutMm + 1, r.loopPullOutMm * 2 + 10, 5000]) {
          expectNoSafer(run(r), run({ ...r, loopPullOutMm: longer }), `pull-out ${r.loopPullOutMm} → ${longer}`)
          compared++
        }
      }
      if (r.loopPerimeterMm !== null) {
        expectNoSafer(run(r), run({ ...r, loopPerimeterMm: r.loopPerimeterMm + 50 }), `perimeter ${r.loopPerimeterMm} → +50`)
        compared++
      }
    }
    expect(compared).toBeGreaterThan(5000)
  })

  it('a longer inner-cord loop or operating cord never makes a covering safer (SS2014 s 6(1)(a); SOR/2019-97 ss 5, 7; 16 CFR 1120.3(e))', () => {
    let compared = 0
    for (const r of records) {
      if (r.innerLoopPullOutMm !== null) {
        expectNoSafer(run(r), run({ ...r, innerLoopPullOutMm: r.innerLoopPullOutMm + 50 }), `inner pull-out ${r.innerLoopPullOutMm} → +50`)
        compared++
      }
      if (r.operatingCordLengthMm !== null) {
        expectNoSafer(run(r), run({ ...r, operatingCordLengthMm: r.operatingCordLengthMm + 100 }), `operating cord ${r.operatingCordLengthMm} → +100`)
        compared++
      }
    }
    expect(compared).toBeGreaterThan(3000)
  })

  it('a weaker tension device pull test never makes a covering safer (ACCC guide, 70 N)', () => {
    for (const r of records) {
      if (r.tensionDeviceHoldN === null) continue
      expectNoSafer(run(r), run({ ...r, tensionDeviceHoldN: r.tensionDeviceHoldN - 10 }), `hold ${r.tensionDeviceHoldN} → -10`)
    }
  })
})
