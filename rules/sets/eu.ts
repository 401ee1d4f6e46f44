import { advise, fail, missing, notApplicable, pass, requireFlag } from '../findings'
import { controlTypes, corded, looped } from '../record'
import type { CoveringRecord, PremisesType } from '../record'
import type { Clause, ClauseContext, Finding, RuleSet } from '../types'
import { sharedAdvice } from './advice'

const EN_13120 = 'EN 13120:2009+A1:2014 with EN 16433:2014 and EN 16434:2014 (as explained in retailer guidance)'
const PSFG_GUIDANCE = 'EN 13120:2009+A1:2014, as summarised by Product Safety Focus Group / BBSA joint guidance'
const ES_SO = 'EN 13120:2009+A1:2014, as summarised by ES-SO guidance'

// Children aged 0–42 months may be present in these premises; offices and industrial premises are outside.
const IN_SCOPE: readonly PremisesType[] = ['home', 'rental_home', 'childcare', 'school', 'hotel', 'healthcare', 'shop']

function cordHeight(r: CoveringRecord, cx: ClauseContext): Finding {
  const clearMin = cx.t.noDeviceMinMm!
  const floorMin = cx.t.absoluteMinMm!
  const low = r.lowestCordPointMm
  if (low === null) {
    return missing(
      cx,
      'lowestCordPointMm',
      clearMin,
      'mm',
      'The height of the lowest point of the cord or chain was not recorded.',
      'Measure from the floor to the lowest point any cord or chain reaches, with the devices as fitted.',
    )
  }
  if (low >= clearMin) {
    return pass(cx, 'lowestCordPointMm', low, clearMin, 'mm', `The cord's lowest point is ${low} mm above the floor, at least ${clearMin} mm: no safety device is needed.`)
  }
  if (low < floorMin) {
    return fail(
      cx,
      'lowestCordPointMm',
      low,
      floorMin,
      'mm',
      `The cord comes down to ${low} mm above the floor; no cord or chain may come lower than ${floorMin} mm, even with a safety device.`,
      `Shorten the cord or chain, or fix its tension device higher, so its lowest point is at least ${floorMin} mm up (at least ${clearMin} mm without a safety device).`,
    )
  }
  if (r.breakaway === true) {
    return pass(cx, 'breakaway', true, true, null, `The cord comes down to ${low} mm, between ${floorMin} and ${clearMin} mm, with a breakaway connector fitted.`)
  }
  if (r.tensionDevice === true) {
    return pass(cx, 'tensionDevice', true, true, null, `The cord comes down to ${low} mm, between ${floorMin} and ${clearMin} mm, held by a tension device.`)
  }
  if (r.breakaway === false && r.tensionDevice === false) {
    return fail(
      cx,
      'lowestCordPointMm',
      low,
      clearMin,
      'mm',
      `The cord comes down to ${low} mm, below ${clearMin} mm, with no safety device.`,
      `Fit a breakaway connector, or a tension device fixed to the wall or frame that holds the loop taut, or shorten the cord to end at ${clearMin} mm or higher.`,
    )
  }
  return missing(
    cx,
    r.breakaway === null ? 'breakaway' : 'tensionDevice',
    true,
    null,
    `The cord comes down to ${low} mm, below ${clearMin} mm, and it was not recorded whether a breakaway connector or tension device is fitted.`,
    'Record whether the cord has a breakaway connector and whether a tension device holds it.',
  )
}

function freeCordLength(r: CoveringRecord, cx: ClauseContext): Finding {
  const clearance = cx.t.clearanceMm!
  const unknownMax = cx.t.unknownHeightMaxMm!
  if (r.breakaway === true || r.tensionDevice === true) {
    return notApplicable(cx, 'A safety device is fitted; eu.cord-height decides how low the cord may come.')
  }
  const length = r.freeCordLengthMm ?? r.operatingCordLengthMm
  if (length === null) {
    return missing(cx, 'freeCordLengthMm', null, 'mm', 'The hanging length of the free cord was not recorded.', 'Measure the longest reachable free cord from the headrail down, in mm.')
  }
  const head = r.headHeightMm
  const limit = head !== null ? Math.max(0, head - clearance) : unknownMax
  const basisWords = head !== null ? `the headrail height (${head} mm) less ${clearance} mm` : `${unknownMax} mm, the figure used when the headrail height is not known`
  if (length > limit) {
    return fail(
      cx,
      'freeCordLengthMm',
      length,
      limit,
      'mm',
      `The free cord hangs ${length} mm with no safety device; it may hang at most ${limit} mm (${basisWords}).`,
      `Shorten the cord to ${limit} mm or less, or fit a breakaway connector or a tension device.`,
    )
  }
  return pass(cx, 'freeCordLengthMm', length, limit, 'mm', `The free cord hangs ${length} mm, within ${limit} mm (${basisWords}).`)
}

function rearCords(r: CoveringRecord, cx: ClauseContext): Finding {
  const max = cx.t.rearSpacingMaxMm!
  const spacing = r.rearCordSpacingMm
  if (spacing === null) {
    if (r.productType === 'other') return notApplicable(cx, 'No rear-cord spacing is recorded for this product.')
    return missing(cx, 'rearCordSpacingMm', max, 'mm', 'The spacing of the rear cords was not recorded.', 'Measure the widest gap between neighbouring rear cords, in mm.')
  }
  if (spacing <= max) {
    return pass(cx, 'rearCordSpacingMm', spacing, max, 'mm', `The rear cords are at most ${spacing} mm apart, within ${max} mm.`)
  }
  if (r.breakaway === true) return pass(cx, 'breakaway', true, true, null, `The rear cords are ${spacing} mm apart and a breakaway is fitted.`)
  if (r.innerCordStops === true) return pass(cx, 'innerCordStops', true, true, null, `The rear cords are ${spacing} mm apart and cord stops are fitted.`)
  if (r.breakaway === false && r.innerCordStops === false) {
    return fail(
      cx,
      'rearCordSpacingMm',
      spacing,
      max,
      'mm',
      `The rear cords are ${spacing} mm apart, more than ${max} mm, with no breakaway or cord stop.`,
      'Fit a breakaway connector or cord stops to the rear cords, or bring them within 200 mm of each other.',
    )
  }
  return missing(
    cx,
    r.innerCordStops === null ? 'innerCordStops' : 'breakaway',
    true,
    null,
    `The rear cords are ${spacing} mm apart and it was not recorded whether a breakaway or cord stop is fitted.`,
    'Record whether the rear cords have cord stops or a breakaway connector.',
  )
}

function warningLabel(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'warningLabel',
    r.warningLabel,
    'A warning label is on the product.',
    'The product carries no warning label.',
    'Ask the supplier for the product warning label and attach it; warnings also belong on the packaging and in the safety instructions.',
    'Not recorded whether a warning label is on the product.',
    'Check the product for its warning label and record it.',
  )
}

function makerName(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'manufacturerLabel',
    r.manufacturerLabel,
    'The name of the maker or importer is on the product.',
    'The product does not show the name of its maker or importer.',
    'Ask the supplier for a product label with the maker’s or importer’s name and attach it.',
    'Not recorded whether the maker’s or importer’s name is on the product.',
    'Look for the maker’s or importer’s name on the product and record it.',
  )
}

function installerName(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'installerLabel',
    r.installerLabel,
    'The professional installer’s name is on the product.',
    'The product does not show the name of the professional installer.',
    'Attach a label with the installer’s name.',
    'Not recorded whether the installer’s name is on the product.',
    'Look for the installer’s label and record it.',
  )
}

function breakawayRelease(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.breakaway !== true) return notApplicable(cx, 'No breakaway connector is recorded.')
  return advise(
    cx,
    'breakaway',
    true,
    'Sources disagree on the force at which a breakaway connector must part (3 kg, 6 kg, about 7 kg), so Tautline sets no figure.',
    'Keep the supplier\'s EN 16434 test report for the connector on file, and check the connector parts and rejoins by hand.',
  )
}

function noKnots(_r: CoveringRecord, cx: ClauseContext): Finding {
  return advise(cx, null, null, 'Knotted or tied cords make loops a child can put their head through.', 'Never knot or tie cords together; untie any knots you find.')
}

function tasselsAndWands(r: CoveringRecord, cx: ClauseContext): Finding {
  return advise(
    cx,
    'control',
    r.control,
    `A loop is the riskiest control; cords are best ending at least ${cx.t.cordEndMinMm} mm above the floor.`,
    'Where you can, use a wand, a tassel with a breakaway, or a cordless control in place of a loop.',
  )
}

export const euClauses: readonly Clause[] = [
  {
    id: 'eu.cord-height',
    title: 'Cords end 1500 mm up, or 600 mm with a safety device',
    kind: 'requirement',
    source: { document: EN_13120, section: 'heights of cords and chains; safety devices (EN 16434)' },
    basis: 'secondary',
    appliesTo: { description: 'corded coverings in premises where children aged 0–42 months may be present', controls: corded },
    thresholds: [
      { name: 'noDeviceMinMm', value: 1500, unit: 'mm', note: 'at or above this, no safety device is needed' },
      {
        name: 'absoluteMinMm',
        value: 600,
        unit: 'mm',
        note: 'sources give 600 mm as the lowest point with a breakaway; Tautline applies it to every cord, tensioned loops included (stricter reading)',
      },
    ],
    note: 'Between 600 and 1500 mm a breakaway connector or a tension device fixed to the wall or frame is needed. Stricter reading: no cord may come below 600 mm even with a tension device.',
    evaluate: cordHeight,
  },
  {
    id: 'eu.free-cord-length',
    title: 'Free cord without a device hangs no lower than 1500 mm',
    kind: 'requirement',
    source: { document: EN_13120, section: 'cord length without a safety device' },
    basis: 'secondary',
    appliesTo: { description: 'free-hanging cords with no safety device, in premises where young children may be present', controls: ['free_cord'] },
    thresholds: [
      { name: 'clearanceMm', value: 1500, unit: 'mm', note: 'hanging length at most headrail height less this' },
      { name: 'unknownHeightMaxMm', value: 1000, unit: 'mm', note: 'when the headrail height is not known' },
    ],
    evaluate: freeCordLength,
  },
  {
    id: 'eu.rear-cords',
    title: 'Rear cords more than 200 mm apart need a breakaway or stop',
    kind: 'requirement',
    source: { document: EN_13120, section: 'roman and other rear-cord blinds' },
    basis: 'secondary',
    appliesTo: { description: 'roman and other rear-cord blinds, whatever the control', controls: controlTypes, products: ['roman', 'other'] },
    thresholds: [{ name: 'rearSpacingMaxMm', value: 200, unit: 'mm', note: 'more than this needs a breakaway or cord stop' }],
    evaluate: rearCords,
  },
  {
    id: 'eu.warning-label',
    title: 'Warning label on the product',
    kind: 'requirement',
    source: { document: PSFG_GUIDANCE, section: 'warnings, instructions and safety devices supplied' },
    basis: 'published',
    appliesTo: { description: 'coverings with operating cords', controls: corded },
    thresholds: [],
    note: 'Warnings are also required on the packaging, with safety instructions and safety devices supplied; only the product can be checked on site.',
    evaluate: warningLabel,
  },
  {
    id: 'eu.maker-name',
    title: 'Maker or importer named on the product',
    kind: 'requirement',
    source: { document: ES_SO, section: 'identification of the maker and installer' },
    basis: 'secondary',
    appliesTo: { description: 'coverings with operating cords', controls: corded },
    thresholds: [],
    evaluate: makerName,
  },
  {
    id: 'eu.installer-name',
    title: 'Professional installer named on the product',
    kind: 'requirement',
    source: { document: ES_SO, section: 'identification of the maker and installer' },
    basis: 'secondary',
    appliesTo: { description: 'coverings with operating cords fitted by a professional installer', controls: corded },
    thresholds: [],
    evaluate: installerName,
  },
  {
    id: 'eu.breakaway-release',
    title: 'Breakaway release force: keep the test report',
    kind: 'advice',
    source: { document: 'EN 16434:2014 (release force as quoted by retailer and trade pages)', section: 'breakaway connectors' },
    basis: 'secondary',
    appliesTo: { description: 'cords with a breakaway connector', controls: corded },
    thresholds: [],
    note: 'Sources disagree (3 kg, 6 kg, about 7 kg; all secondary), so there is no pass or fail on the release force.',
    evaluate: breakawayRelease,
  },
  {
    id: 'advice.no-knots',
    title: 'Never knot or tie cords together',
    kind: 'advice',
    source: { document: 'BBSA consumer advice', section: 'cords' },
    basis: 'secondary',
    appliesTo: { description: 'coverings with operating cords', controls: corded },
    thresholds: [],
    evaluate: noKnots,
  },
  {
    id: 'advice.tassels-wands',
    title: 'Use wands, tassels or breakaways in place of loops',
    kind: 'advice',
    source: { document: 'Hackney Trading Standards and NSAI consumer advice', section: 'safer controls' },
    basis: 'published',
    appliesTo: { description: 'coverings worked by a loop', controls: looped },
    thresholds: [{ name: 'cordEndMinMm', value: 1600, unit: 'mm', note: 'NSAI: cords end at least 1.6 m above the floor' }],
    evaluate: tasselsAndWands,
  },
  ...sharedAdvice,
]

export const euRuleSet: RuleSet = {
  jurisdiction: 'EU',
  name: 'European Union and United Kingdom',
  version: 'EU-2026.12.0',
  scope: {
    description:
      'EN 13120 covers premises where children aged 0–42 months may be present (homes, hotels, hospitals, schools, shops, places of worship, nurseries); offices and industrial premises are outside. Compliance gives a presumption of conformity with the UK General Product Safety Regulations 2005.',
    premises: IN_SCOPE,
  },
  clauses: euClauses,
}
