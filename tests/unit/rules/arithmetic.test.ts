import { describe, expect, it } from 'vitest'
import {
  inchesToMm,
  installerGuide,
  lowestCleatHeightMm,
  maxDropWithSafetyDeviceMm,
  maxUnguardedDropMm,
  mmToInches,
  perimeterFromPullOutMm,
  pullOutFromPerimeterMm,
  tensionDeviceFixingRange,
  tensionDevicePosition,
  usCustomOperatingCordDefaultMm,
} from '../../../rules'
import { auBase, clause, euBase } from './fixtures'

describe('maxUnguardedDropMm — longest drop needing no safety device', () => {
  it('AU, headrail 2400 mm: 799 mm keeps the loop above 1600 mm (SS2014 s 6(1)(a); 1600 mm counts as inside)', () => {
    expect(maxUnguardedDropMm({ jurisdiction: 'AU', headHeightMm: 2400, control: 'chain_loop' })).toBe(799)
  })

  it('AU figure agrees with the check: 799 mm passes, 800 mm fails (SS2014 s 6(1)(a))', () => {
    const at = (drop: number) => ({ tensionDevice: false, headHeightMm: 2400, loopPullOutMm: drop, lowestCordPointMm: 2400 - drop })
    expect(clause('au.loop-reach', auBase, at(799)).verdict).toBe('pass')
    expect(clause('au.loop-reach', auBase, at(800)).verdict).toBe('fail')
  })

  it('AU, low headrail: a loop shorter than 220 mm is allowed anywhere, so 219 mm (SS2014 s 6(1)(a))', () => {
    expect(maxUnguardedDropMm({ jurisdiction: 'AU', headHeightMm: 1700, control: 'chain_loop' })).toBe(219)
  })

  it('CA: 220 mm whatever the height (SOR/2019-97 ss 5–7)', () => {
    expect(maxUnguardedDropMm({ jurisdiction: 'CA', headHeightMm: 3000, control: 'free_cord' })).toBe(220)
    expect(maxUnguardedDropMm({ jurisdiction: 'CA', headHeightMm: 1200, control: 'chain_loop' })).toBe(220)
  })

  it('US: stock free cords 8 in = 203.2 mm, stock loops 0 (16 CFR 1120.3(e), A100.1-2018 §4.3.1); custom loops 0 (A100.1 tension device); custom free cords 40 % (2018) or 0 (2022)', () => {
    expect(maxUnguardedDropMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'free_cord', madeTo: 'stock' })).toBe(203.2)
    expect(maxUnguardedDropMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'chain_loop', madeTo: 'stock' })).toBe(0)
    expect(maxUnguardedDropMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'chain_loop', madeTo: 'custom' })).toBe(0)
    expect(
      maxUnguardedDropMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'free_cord', madeTo: 'custom', productHeightMm: 1000, manufacturedOn: '2023-05' }),
    ).toBe(400)
    expect(maxUnguardedDropMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'free_cord', madeTo: 'custom', manufacturedOn: '2024-06' })).toBe(0)
    expect(maxUnguardedDropMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'free_cord', productHeightMm: 300, manufacturedOn: '2023-05' })).toBe(120)
  })

  it('EU: headrail less 1500 mm, never below 0 (EN 13120+A1, secondary)', () => {
    expect(maxUnguardedDropMm({ jurisdiction: 'EU', headHeightMm: 2300, control: 'cord_loop' })).toBe(800)
    expect(maxUnguardedDropMm({ jurisdiction: 'EU', headHeightMm: 1400, control: 'cord_loop' })).toBe(0)
    expect(clause('eu.cord-height', euBase, { headHeightMm: 2300, lowestCordPointMm: 2300 - 800 }).verdict).toBe('pass')
    expect(clause('eu.cord-height', euBase, { headHeightMm: 2300, lowestCordPointMm: 2300 - 801 }).verdict).toBe('fail')
  })

  it('no cord, no figure', () => {
    expect(maxUnguardedDropMm({ jurisdiction: 'AU', headHeightMm: 2400, control: 'motorised' })).toBeNull()
  })

  it('refuses a negative or non-finite height', () => {
    expect(() => maxUnguardedDropMm({ jurisdiction: 'AU', headHeightMm: -1, control: 'chain_loop' })).toThrow(RangeError)
    expect(() => maxUnguardedDropMm({ jurisdiction: 'AU', headHeightMm: Number.NaN, control: 'chain_loop' })).toThrow(RangeError)
  })
})

describe('maxDropWithSafetyDeviceMm — drop allowed with a breakaway or a tension device', () => {
  it('AU: a 70 N tension device allows any drop; a breakaway does not count (ACCC guide; SS2014)', () => {
    expect(maxDropWithSafetyDeviceMm({ jurisdiction: 'AU', headHeightMm: 2400, control: 'chain_loop' })).toEqual({ withBreakawayMm: null, withTensionDeviceMm: 2400 })
  })

  it('EU: both devices down to 600 mm above the floor (EN 13120+A1, secondary; stricter reading for tension devices)', () => {
    expect(maxDropWithSafetyDeviceMm({ jurisdiction: 'EU', headHeightMm: 2400, control: 'chain_loop' })).toEqual({ withBreakawayMm: 1800, withTensionDeviceMm: 1800 })
    expect(maxDropWithSafetyDeviceMm({ jurisdiction: 'EU', headHeightMm: 2400, control: 'free_cord' })).toEqual({ withBreakawayMm: 1800, withTensionDeviceMm: null })
  })

  it('CA: neither device makes a reachable cord acceptable (SOR/2019-97 s 6)', () => {
    expect(maxDropWithSafetyDeviceMm({ jurisdiction: 'CA', headHeightMm: 2400, control: 'chain_loop' })).toEqual({ withBreakawayMm: null, withTensionDeviceMm: null })
  })

  it('US: custom loops with a tension device only (A100.1, WCMA/WCSC FAQ)', () => {
    expect(maxDropWithSafetyDeviceMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'chain_loop', madeTo: 'custom' }).withTensionDeviceMm).toBe(2400)
    expect(maxDropWithSafetyDeviceMm({ jurisdiction: 'US', headHeightMm: 2400, control: 'chain_loop', madeTo: 'stock' }).withTensionDeviceMm).toBeNull()
  })
})

describe('tensionDeviceFixingRange and tensionDevicePosition', () => {
  it('AU: floor to headrail, pull test at or below 1600 mm with 70 N (ACCC guide)', () => {
    expect(tensionDeviceFixingRange({ jurisdiction: 'AU', headHeightMm: 2400 })).toMatchObject({
      allowed: true,
      lowestMm: 0,
      highestMm: 2400,
      pullTestAtOrBelowMm: 1600,
      holdN: 70,
    })
  })

  it('EU: from 600 mm (EN 13120+A1, secondary); CA: not allowed (SOR/2019-97 s 6)', () => {
    expect(tensionDeviceFixingRange({ jurisdiction: 'EU', headHeightMm: 2400 })).toMatchObject({ allowed: true, lowestMm: 600, highestMm: 2400 })
    expect(tensionDeviceFixingRange({ jurisdiction: 'CA', headHeightMm: 2400 }).allowed).toBe(false)
    expect(tensionDeviceFixingRange({ jurisdiction: 'US', headHeightMm: 2400 }).allowed).toBe(true)
  })

  it('AU, 1000 mm loop under a 2400 mm headrail: taut at 1400, fix at 1410, pull test needed (common practice; ACCC guide)', () => {
    const p = tensionDevicePosition({ jurisdiction: 'AU', headHeightMm: 2400, chainLoopLengthMm: 1000 })
    expect(p).toMatchObject({ tautMm: 1400, easedMm: 1410, easeMm: 10, withinRange: true, pullTestNeeded: true, shortenLoopByMm: 0 })
    expect(p.note).toMatch(/about 1410 mm/)
  })

  it('AU, eased point above 1600 mm needs no pull test (ACCC guide)', () => {
    expect(tensionDevicePosition({ jurisdiction: 'AU', headHeightMm: 2400, chainLoopLengthMm: 790 }).pullTestNeeded).toBe(false)
    expect(tensionDevicePosition({ jurisdiction: 'AU', headHeightMm: 2400, chainLoopLengthMm: 810 }).pullTestNeeded).toBe(true)
  })

  it('EU, loop too long for the window: says how much to shorten (EN 13120+A1 600 mm, secondary)', () => {
    const p = tensionDevicePosition({ jurisdiction: 'EU', headHeightMm: 2000, chainLoopLengthMm: 1500 })
    expect(p).toMatchObject({ tautMm: 500, easedMm: 510, withinRange: false, shortenLoopByMm: 90 })
    expect(tensionDevicePosition({ jurisdiction: 'EU', headHeightMm: 2000, chainLoopLengthMm: 1410 }).withinRange).toBe(true)
  })

  it('CA: never within range (SOR/2019-97 s 6)', () => {
    expect(tensionDevicePosition({ jurisdiction: 'CA', headHeightMm: 2000, chainLoopLengthMm: 800 }).withinRange).toBe(false)
  })
})

describe('cleats, cord defaults and conversions', () => {
  it('lowest cleat: AU 1600 mm (SS2014), EU 1500 mm (secondary), none for CA and US', () => {
    expect(lowestCleatHeightMm('AU')).toBe(1600)
    expect(lowestCleatHeightMm('EU')).toBe(1500)
    expect(lowestCleatHeightMm('CA')).toBeNull()
    expect(lowestCleatHeightMm('US')).toBeNull()
  })

  it('US custom default cord is 40 % of product height (A100.1-2018, secondary)', () => {
    expect(usCustomOperatingCordDefaultMm(1000)).toBe(400)
    expect(usCustomOperatingCordDefaultMm(1234)).toBeCloseTo(493.6, 9)
    expect(usCustomOperatingCordDefaultMm(3)).toBe(1.2)
  })

  it('220 mm pulled out is a 440 mm perimeter and back (SOR/2019-97 s 7)', () => {
    expect(perimeterFromPullOutMm(220)).toBe(440)
    expect(pullOutFromPerimeterMm(440)).toBe(220)
    expect(pullOutFromPerimeterMm(perimeterFromPullOutMm(137.5))).toBe(137.5)
  })

  it('8 in is 203.2 mm (1 in = 25.4 mm by definition; 16 CFR 1120 short cord)', () => {
    expect(inchesToMm(8)).toBeCloseTo(203.2, 9)
    expect(mmToInches(25.4)).toBe(1)
    expect(mmToInches(inchesToMm(3.5))).toBeCloseTo(3.5, 12)
  })
})

describe('installerGuide', () => {
  it('gives every figure with unit, source and basis, as plain JSON (sources as per each function)', () => {
    const g = installerGuide({ jurisdiction: 'AU', headHeightMm: 2400, control: 'chain_loop', chainLoopLengthMm: 1000 })
    expect(JSON.parse(JSON.stringify(g))).toEqual(g)
    expect(g.maxUnguardedDrop).toMatchObject({ value: 799, unit: 'mm', basis: 'published' })
    expect(g.maxUnguardedDrop.source).toMatch(/s 6\(1\)\(a\)/)
    expect(g.tensionDeviceHold).toMatchObject({ value: 70, unit: 'N' })
    expect(g.tensionDeviceEased).toMatchObject({ value: 1410, basis: 'common_practice' })
    expect(g.lowestCleatHeight.value).toBe(1600)
    expect(g.usCustomOperatingCordDefault).toBeNull()
    expect(g.rulesVersion).toMatch(/^AU-/)
  })

  it('US with a product height adds the 40 % default (A100.1-2018, secondary)', () => {
    const g = installerGuide({ jurisdiction: 'US', headHeightMm: 2400, control: 'free_cord', productHeightMm: 1500, madeTo: 'stock' })
    expect(g.usCustomOperatingCordDefault).toMatchObject({ value: 600, unit: 'mm', basis: 'secondary' })
    expect(g.maxUnguardedDrop.value).toBe(203.2)
  })

  it('notes when the chain is too long for the window (EN 13120+A1, secondary)', () => {
    const g = installerGuide({ jurisdiction: 'EU', headHeightMm: 2000, control: 'chain_loop', chainLoopLengthMm: 1500 })
    expect(g.notes.some(n => /shorten its hanging length by at least 90 mm/.test(n))).toBe(true)
  })
})
