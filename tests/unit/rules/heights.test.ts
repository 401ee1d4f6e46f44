import { describe, expect, it } from 'vitest'
import { HEIGHTS_AND_DROPS, installerGuide, tensionDevicePosition } from '../../../rules'
import { deviceNotices } from '../../../composables/useFittingForm'

// The calculator and the form use one reference: every height is above the floor (as the form's fields are),
// a drop is a length down from the top of the head rail, and the calculator says so once.

describe('the installer\'s calculator speaks of heights above the floor', () => {
  it('places the tension device at a height above the floor: a 1000 mm drop under a 2400 mm head rail is taut at 1400 mm, fixed at 1410 mm (common practice: eased ~10 mm)', () => {
    const p = tensionDevicePosition({ jurisdiction: 'AU', headHeightMm: 2400, chainLoopLengthMm: 1000 })
    expect(p.easedMm).toBe(1410)
    expect(p.note).toMatch(/about 1410 mm above the floor/)
    expect(p.note).not.toMatch(/from the top of the head ?rail/i)
  })

  it('says once that heights are above the floor and drops hang from the top of the head rail', () => {
    for (const j of ['AU', 'CA', 'US', 'EU'] as const) {
      const g = installerGuide({ jurisdiction: j, headHeightMm: 2400, control: 'chain_loop', chainLoopLengthMm: 1000 })
      expect(g.notes.filter(n => n === HEIGHTS_AND_DROPS)).toHaveLength(1)
      const words = [...g.notes, g.tensionDeviceEased?.note ?? ''].join(' ')
      expect(words).not.toMatch(/heights? (are|is) (measured )?from the top/i)
    }
  })
})

describe('the form warns when the tension device sits above the loop\'s lowest point (common practice)', () => {
  it('warns at 1100 mm over a loop reaching 1000 mm, and not at or below it', () => {
    expect(deviceNotices({ tensionDevice: true, tensionDeviceHeightMm: 1100, lowestCordPointMm: 1000 }).tensionDeviceHeightMm).toMatch(/1100 mm up .* 1000 mm.*common practice/)
    expect(deviceNotices({ tensionDevice: true, tensionDeviceHeightMm: 1000, lowestCordPointMm: 1000 })).toEqual({})
    expect(deviceNotices({ tensionDevice: true, tensionDeviceHeightMm: 900, lowestCordPointMm: 1000 })).toEqual({})
    expect(deviceNotices({ tensionDevice: false, tensionDeviceHeightMm: 1100, lowestCordPointMm: 1000 })).toEqual({})
    expect(deviceNotices({ tensionDevice: true, tensionDeviceHeightMm: null, lowestCordPointMm: 1000 })).toEqual({})
  })
})
