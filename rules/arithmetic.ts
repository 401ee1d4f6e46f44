import { corded, looped } from './record'
import type { ControlType, Jurisdiction, MadeTo } from './record'
import { ruleSets } from './sets'
import { inchesToMm } from './units'
import type { Basis, Unit } from './types'

// The installer's figures read their thresholds from the built-in clauses, so the calculator and the
// check engine can never disagree.

function clauseOf(j: Jurisdiction, id: string) {
  const c = ruleSets[j].clauses.find(x => x.id === id)
  if (c === undefined) throw new Error(`rulebook has no clause ${id} in ${j}`)
  return c
}

function thresholdOf(j: Jurisdiction, id: string, name: string): number {
  const t = clauseOf(j, id).thresholds.find(x => x.name === name)
  if (t === undefined) throw new Error(`clause ${id} has no threshold ${name}`)
  return t.value
}

function sourceOf(j: Jurisdiction, id: string): string {
  const c = clauseOf(j, id)
  return `${c.source.document}, ${c.source.section}`
}

function checkLength(name: string, value: number): void {
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be a length of 0 mm or more`)
}

const EDITION_2022_FROM = '2024-06-01'

/** True when a US custom product falls under the 2022 edition: made from 1 June 2024, or date unknown (the current edition). */
function usEdition2022(manufacturedOn: string | null | undefined): boolean {
  if (manufacturedOn === null || manufacturedOn === undefined) return true
  return manufacturedOn.length === 7 ? manufacturedOn >= EDITION_2022_FROM.slice(0, 7) : manufacturedOn >= EDITION_2022_FROM
}

export interface DropInput {
  jurisdiction: Jurisdiction
  /** Top of the headrail above the floor. */
  headHeightMm: number
  control: ControlType
  /** US only: stock or custom; when not given the stricter of the two figures is returned. */
  madeTo?: MadeTo | null
  /** US custom free cords: height of the covering, for the 40 % default. */
  productHeightMm?: number | null
  /** US custom: YYYY-MM or YYYY-MM-DD; when not given the current (2022) edition is used. */
  manufacturedOn?: string | null
}

/**
 * Longest chain or cord drop below the headrail that needs no safety device, in mm (whole mm except the US 8 in); null when the
 * control has no cord or no figure exists.
 * - AU: Safety Standard 2014 s 6(1)(a): the loop's lowest point stays above 1600 mm (a point at 1600 mm is
 *   inside, stricter reading), or the loop is shorter than 220 mm.
 * - CA: SOR/2019-97 ss 5–7: 220 mm (a 440 mm loop perimeter), whatever the height.
 * - US: 16 CFR 1120.3(e) / A100.1-2018 §4.3.1: stock free cords 203.2 mm (8 in exactly), stock loops 0 (they
 *   must be inaccessible); custom loops always need a tension device
 *   (0); custom free cords 40 % of product height (2018 edition) or none (2022 edition, from 1 June 2024).
 * - EU: EN 13120+A1 (secondary): lowest point at least 1500 mm, so head height less 1500 mm.
 */
export function maxUnguardedDropMm(input: DropInput): number | null {
  const { jurisdiction: j, headHeightMm: head, control } = input
  checkLength('headHeightMm', head)
  if (!corded.includes(control)) return null
  switch (j) {
    case 'AU': {
      const loopMin = thresholdOf('AU', 'au.loop-reach', 'loopMinMm')
      const zoneTop = thresholdOf('AU', 'au.loop-reach', 'zoneTopMm')
      return Math.max(loopMin - 1, Math.ceil(head - zoneTop) - 1, 0)
    }
    case 'CA': {
      const free = thresholdOf('CA', 'ca.free-end-cord', 'freeEndMaxMm')
      const loop = pullOutFromPerimeterMm(thresholdOf('CA', 'ca.loop-perimeter', 'loopPerimeterMaxMm'))
      const span = thresholdOf('CA', 'ca.contact-span', 'spanMaxMm')
      return control === 'free_cord' ? Math.min(free, loop) : Math.min(loop, span)
    }
    case 'US': {
      const stockShort = inchesToMm(thresholdOf('US', 'us.stock-operating-cords', 'shortCordMaxIn'))
      // A stock continuous loop is never a short cord: it must be inaccessible (A100.1-2018 §4.3.1).
      const stock = looped.includes(control) ? 0 : stockShort
      let custom: number | null
      if (looped.includes(control)) custom = 0
      else if (usEdition2022(input.manufacturedOn)) custom = 0
      else custom = input.productHeightMm === null || input.productHeightMm === undefined ? null : usCustomOperatingCordDefaultMm(input.productHeightMm)
      if (input.madeTo === 'stock') return stock
      if (input.madeTo === 'custom') return custom
      return custom === null ? stock : Math.min(stock, custom)
    }
    case 'EU':
      return Math.max(0, head - thresholdOf('EU', 'eu.cord-height', 'noDeviceMinMm'))
  }
}

export interface DeviceDrops {
  /** Longest drop with a breakaway connector; null when a breakaway does not make the cord acceptable. */
  withBreakawayMm: number | null
  /** Longest drop with a tension device fixed to the wall or frame; null when a device does not make it acceptable. */
  withTensionDeviceMm: number | null
}

/**
 * Longest drop allowed with a safety device, in mm.
 * - AU: ACCC installation guide: a loop held taut by a tension device that holds 70 N may reach any height
 *   (the device may sit as low as the floor); the 2014 standard makes no allowance for breakaways.
 * - CA: SOR/2019-97 ss 5–7: neither device makes a reachable cord acceptable (a tensioned loop still spans
 *   more than 22 cm).
 * - US: A100.1 (secondary / WCMA FAQ): custom loops with a tension device only; stock cords cannot rely on a device.
 * - EU: EN 13120+A1 (secondary): lowest point at least 600 mm with a breakaway or a tension device
 *   (600 mm applied to tension devices too: stricter reading).
 */
export function maxDropWithSafetyDeviceMm(input: DropInput): DeviceDrops {
  const { jurisdiction: j, headHeightMm: head, control } = input
  checkLength('headHeightMm', head)
  const loop = looped.includes(control)
  if (!corded.includes(control)) return { withBreakawayMm: null, withTensionDeviceMm: null }
  switch (j) {
    case 'AU':
      return { withBreakawayMm: null, withTensionDeviceMm: loop ? head : null }
    case 'CA':
      return { withBreakawayMm: null, withTensionDeviceMm: null }
    case 'US':
      return { withBreakawayMm: null, withTensionDeviceMm: loop && input.madeTo === 'custom' ? head : null }
    case 'EU': {
      const floorMin = thresholdOf('EU', 'eu.cord-height', 'absoluteMinMm')
      const drop = Math.max(0, head - floorMin)
      return { withBreakawayMm: drop, withTensionDeviceMm: loop ? drop : null }
    }
  }
}

export interface FixingRange {
  /** Whether a tension device can make a loop acceptable at all. */
  allowed: boolean
  /** Lowest height above the floor the device may be fixed at, mm; null where no figure is published. */
  lowestMm: number | null
  /** Highest height, mm: the headrail. */
  highestMm: number | null
  /** At or below this height the device must pass the pull test. */
  pullTestAtOrBelowMm: number | null
  /** Force the device must hold for 10 s in any direction. */
  holdN: number | null
  note: string
  source: string
}

/**
 * Range of heights at which a tension device may be fixed.
 * - AU: ACCC installation guide: anywhere, but at or below 1600 mm it must hold 70 N for 10 s in any direction
 *   and keep the cord in (1600 mm inclusive: stricter reading).
 * - EU: EN 13120+A1 (secondary): not below 600 mm; at 1500 mm or above no device is needed.
 * - US: WCMA/WCSC FAQ on A100.1-2022: factory-fitted on custom loops; no height figure published.
 * - CA: SOR/2019-97 s 6: a device does not make a reachable loop acceptable.
 */
export function tensionDeviceFixingRange(input: { jurisdiction: Jurisdiction, headHeightMm: number }): FixingRange {
  const { jurisdiction: j, headHeightMm: head } = input
  checkLength('headHeightMm', head)
  switch (j) {
    case 'AU': {
      const zoneTop = thresholdOf('AU', 'au.tension-device', 'zoneTopMm')
      return {
        allowed: true,
        lowestMm: 0,
        highestMm: head,
        pullTestAtOrBelowMm: zoneTop,
        holdN: thresholdOf('AU', 'au.tension-device', 'holdMinN'),
        note: `Fixed at or below ${zoneTop} mm, the device must stay fixed under the pull test and a child must not be able to take the cord out.`,
        source: sourceOf('AU', 'au.tension-device'),
      }
    }
    case 'EU': {
      const floorMin = thresholdOf('EU', 'eu.cord-height', 'absoluteMinMm')
      const clearMin = thresholdOf('EU', 'eu.cord-height', 'noDeviceMinMm')
      return {
        allowed: head >= floorMin,
        lowestMm: floorMin,
        highestMm: head,
        pullTestAtOrBelowMm: null,
        holdN: null,
        note: `Fix it to the wall or frame, not below ${floorMin} mm; at ${clearMin} mm or higher no safety device is needed.`,
        source: sourceOf('EU', 'eu.cord-height'),
      }
    }
    case 'US':
      return {
        allowed: true,
        lowestMm: null,
        highestMm: head,
        pullTestAtOrBelowMm: null,
        holdN: null,
        note: 'Custom loops only: the device is fitted at the factory and the product must work only with it installed under tension. Stock products cannot rely on a device.',
        source: sourceOf('US', 'us.custom-2022-loop-tension'),
      }
    case 'CA':
      return {
        allowed: false,
        lowestMm: null,
        highestMm: null,
        pullTestAtOrBelowMm: null,
        holdN: null,
        note: 'A tension device does not make a reachable loop acceptable: the loop still spans more than 22 cm between contact points.',
        source: sourceOf('CA', 'ca.contact-span'),
      }
  }
}

export interface DevicePosition {
  /** Height above the floor where the loop is just taut (the device's pulley at the bottom of the loop). */
  tautMm: number
  /** Where to fix it: taut, eased back about 10 mm towards the headrail. */
  easedMm: number
  easeMm: number
  /** The eased point lies in the permitted fixing range. */
  withinRange: boolean
  /** AU: the eased point is at or below 1600 mm, so the 70 N pull test applies. */
  pullTestNeeded: boolean
  /** How much shorter the hanging loop must be to bring the eased point into range; 0 when it is. */
  shortenLoopByMm: number
  note: string
  source: string
}

/**
 * Where to fix a tension device for a given chain loop: taut, then eased about 10 mm (common practice).
 * `chainLoopLengthMm` is the loop's hanging length: from the top of the headrail to the bottom of the loop
 * hanging free (half the chain's total length). Range and pull test as in {@link tensionDeviceFixingRange}.
 */
export function tensionDevicePosition(input: { jurisdiction: Jurisdiction, headHeightMm: number, chainLoopLengthMm: number }): DevicePosition {
  const { jurisdiction: j, headHeightMm: head, chainLoopLengthMm: loop } = input
  checkLength('headHeightMm', head)
  checkLength('chainLoopLengthMm', loop)
  const ease = thresholdOf(j, 'advice.ease-tension', 'easeMm')
  const range = tensionDeviceFixingRange({ jurisdiction: j, headHeightMm: head })
  const taut = head - loop
  const eased = taut + ease
  const lowest = range.lowestMm ?? 0
  const withinRange = range.allowed && eased >= lowest && eased <= head
  const shortenLoopByMm = range.allowed && eased < lowest ? Math.ceil(lowest - eased) : 0
  const pullTestNeeded = range.pullTestAtOrBelowMm !== null && eased <= range.pullTestAtOrBelowMm
  let note: string
  if (!range.allowed) note = range.note
  else if (eased > head) note = `The loop is shorter than the ${ease} mm ease; no tension device is needed to hold it.`
  else if (shortenLoopByMm > 0) note = `The loop is too long for this window: shorten its hanging length by at least ${shortenLoopByMm} mm.`
  else
    note = `Fix the device at about ${eased} mm above the floor (taut at ${taut} mm, eased ${ease} mm back up). The chain leaves the head rail a little below its top, so confirm on site.${
      pullTestNeeded ? ` Pull-test it with ${range.holdN} N for 10 s in any direction.` : ''
    }`
  return { tautMm: taut, easedMm: eased, easeMm: ease, withinRange, pullTestNeeded, shortenLoopByMm, note, source: `common practice; ${range.source}` }
}

/**
 * Lowest height for a cleat that secures a cord, mm; null where no figure is set.
 * - AU: 2014 safety standard, cleats: at least 1600 mm.
 * - EU: EN 13120+A1 (secondary): cleats sit at about 1500 mm, where a cord needs no device.
 * - CA, US: no cleat figure (CA: a cleat does not make a cord unreachable).
 */
export function lowestCleatHeightMm(jurisdiction: Jurisdiction): number | null {
  if (jurisdiction === 'AU') return thresholdOf('AU', 'au.cleat-height', 'cleatMinMm')
  if (jurisdiction === 'EU') return thresholdOf('EU', 'eu.cord-height', 'noDeviceMinMm')
  return null
}

/** US custom products, ANSI/WCMA A100.1-2018 (secondary): the operating cord defaults to 40 % of product height. */
export function usCustomOperatingCordDefaultMm(productHeightMm: number): number {
  checkLength('productHeightMm', productHeightMm)
  return (productHeightMm * thresholdOf('US', 'us.custom-2018-cord-length', 'defaultCordPercentOfHeight')) / 100
}

/** Loop perimeter from its pulled-out length laid flat (SOR/2019-97 s 7: 22 cm pulled out is 44 cm around). */
export function perimeterFromPullOutMm(pullOutMm: number): number {
  checkLength('pullOutMm', pullOutMm)
  return pullOutMm * 2
}

/** Pulled-out loop length from its perimeter (SOR/2019-97 s 7: 44 cm around is 22 cm pulled out). */
export function pullOutFromPerimeterMm(perimeterMm: number): number {
  checkLength('perimeterMm', perimeterMm)
  return perimeterMm / 2
}

export { inchesToMm, mmToInches } from './units'

export interface GuideFigure {
  value: number | null
  unit: Unit
  source: string
  basis: Basis
  note: string
}

export interface InstallerGuideInput {
  jurisdiction: Jurisdiction
  headHeightMm: number
  control: ControlType
  chainLoopLengthMm?: number | null
  productHeightMm?: number | null
  madeTo?: MadeTo | null
  manufacturedOn?: string | null
}

export interface InstallerGuide {
  jurisdiction: Jurisdiction
  rulesVersion: string
  headHeightMm: number
  control: ControlType
  maxUnguardedDrop: GuideFigure
  maxDropWithBreakaway: GuideFigure
  maxDropWithTensionDevice: GuideFigure
  tensionDeviceLowest: GuideFigure
  tensionDeviceHighest: GuideFigure
  tensionDevicePullTestAtOrBelow: GuideFigure
  tensionDeviceHold: GuideFigure
  tensionDeviceTaut: GuideFigure | null
  tensionDeviceEased: GuideFigure | null
  lowestCleatHeight: GuideFigure
  usCustomOperatingCordDefault: GuideFigure | null
  notes: string[]
}

function basisOf(j: Jurisdiction, id: string): Basis {
  return clauseOf(j, id).basis
}

const DROP_CLAUSE: Record<Jurisdiction, string> = {
  AU: 'au.loop-reach',
  CA: 'ca.loop-perimeter',
  US: 'us.stock-operating-cords',
  EU: 'eu.cord-height',
}

const DEVICE_CLAUSE: Record<Jurisdiction, string> = {
  AU: 'au.tension-device',
  CA: 'ca.contact-span',
  US: 'us.custom-2022-loop-tension',
  EU: 'eu.cord-height',
}

const CLEAT_CLAUSE: Record<Jurisdiction, string> = {
  AU: 'au.cleat-height',
  CA: 'ca.free-end-cord',
  US: 'us.stock-operating-cords',
  EU: 'eu.cord-height',
}

const CLEAT_NOTE: Record<Jurisdiction, string> = {
  AU: 'lowest height for a cleat securing a cord; a child can unwind a cleat',
  CA: 'no cleat height: a cord wound on a cleat is still reachable, whatever the height',
  US: 'no cleat height: stock cords must be short, cordless or inaccessible',
  EU: 'cleats sit at about this height, where a cord needs no safety device',
}

/**
 * The calculator's one reference, said once: every height it gives is above the floor, as the form's fields are
 * (head rail, lowest cord point, tension device, cleat); a drop is a length hanging down from the top of the head rail.
 */
export const HEIGHTS_AND_DROPS = 'Every height here is above the floor, as in the form; a drop is measured down from the top of the head rail.'

/** Every installer figure for one covering, with units and sources, for the calculator panel. */
export function installerGuide(input: InstallerGuideInput): InstallerGuide {
  const j = input.jurisdiction
  const drops: DropInput = input
  const unguarded = maxUnguardedDropMm(drops)
  const guarded = maxDropWithSafetyDeviceMm(drops)
  const range = tensionDeviceFixingRange({ jurisdiction: j, headHeightMm: input.headHeightMm })
  const dropSource = sourceOf(j, DROP_CLAUSE[j])
  const dropBasis = basisOf(j, DROP_CLAUSE[j])
  const deviceSource = sourceOf(j, DEVICE_CLAUSE[j])
  const deviceBasis = basisOf(j, DEVICE_CLAUSE[j])
  const fig = (value: number | null, unit: Unit, source: string, basis: Basis, note: string): GuideFigure => ({ value, unit, source, basis, note })
  const notes: string[] = [
    'Tautline supports judgement; it does not certify. Check the product’s own instructions.',
    HEIGHTS_AND_DROPS,
  ]
  let taut: GuideFigure | null = null
  let eased: GuideFigure | null = null
  if (input.chainLoopLengthMm !== null && input.chainLoopLengthMm !== undefined && looped.includes(input.control)) {
    const pos = tensionDevicePosition({ jurisdiction: j, headHeightMm: input.headHeightMm, chainLoopLengthMm: input.chainLoopLengthMm })
    taut = fig(pos.tautMm, 'mm', pos.source, 'common_practice', 'where the loop is just taut')
    eased = fig(pos.easedMm, 'mm', pos.source, 'common_practice', pos.note)
    if (!pos.withinRange) notes.push(pos.note)
  }
  let usDefault: GuideFigure | null = null
  if (j === 'US' && input.productHeightMm !== null && input.productHeightMm !== undefined) {
    usDefault = fig(
      usCustomOperatingCordDefaultMm(input.productHeightMm),
      'mm',
      sourceOf('US', 'us.custom-2018-cord-length'),
      basisOf('US', 'us.custom-2018-cord-length'),
      'custom products made before 1 June 2024; longer only at the buyer’s request',
    )
  }
  const cleat = lowestCleatHeightMm(j)
  return {
    jurisdiction: j,
    rulesVersion: ruleSets[j].version,
    headHeightMm: input.headHeightMm,
    control: input.control,
    maxUnguardedDrop: fig(unguarded, 'mm', dropSource, dropBasis, unguarded === null ? 'no cord, or no figure applies' : 'longest drop below the headrail with no safety device'),
    maxDropWithBreakaway: fig(guarded.withBreakawayMm, 'mm', deviceSource, deviceBasis, guarded.withBreakawayMm === null ? 'a breakaway does not make this cord acceptable' : 'with a breakaway connector'),
    maxDropWithTensionDevice: fig(
      guarded.withTensionDeviceMm,
      'mm',
      deviceSource,
      deviceBasis,
      guarded.withTensionDeviceMm === null ? 'a tension device does not make this cord acceptable' : 'with a tension device fixed to the wall or frame',
    ),
    tensionDeviceLowest: fig(range.lowestMm, 'mm', range.source, deviceBasis, range.note),
    tensionDeviceHighest: fig(range.highestMm, 'mm', range.source, deviceBasis, 'the headrail'),
    tensionDevicePullTestAtOrBelow: fig(range.pullTestAtOrBelowMm, 'mm', range.source, deviceBasis, 'a device fixed at or below this height must pass the pull test'),
    tensionDeviceHold: fig(range.holdN, 'N', range.source, deviceBasis, 'held for 10 s in any direction'),
    tensionDeviceTaut: taut,
    tensionDeviceEased: eased,
    lowestCleatHeight: fig(cleat, 'mm', sourceOf(j, CLEAT_CLAUSE[j]), basisOf(j, CLEAT_CLAUSE[j]), CLEAT_NOTE[j]),
    usCustomOperatingCordDefault: usDefault,
    notes,
  }
}
