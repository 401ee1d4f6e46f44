import { advise, fail, longestOf, missing, notApplicable, pass, requireFlag } from '../findings'
import { controlTypes, corded, innerCorded, looped, premisesTypes } from '../record'
import type { CoveringRecord, PremisesType } from '../record'
import type { Clause, ClauseContext, DateWindow, Finding, RuleSet } from '../types'
import { sharedAdvice } from './advice'

const PSFG_GUIDANCE = 'EN 13120:2009+A1:2014, as summarised by Product Safety Focus Group / BBSA joint guidance'
const ES_SO = 'EN 13120:2009+A1:2014, as summarised by ES-SO guidance'
const DECISION_2011_477 = 'Commission Decision 2011/477/EU (safety requirements for European standards on internal blinds, corded window coverings and safety devices)'
const DECISION_2014_531 = 'Commission Implementing Decision 2014/531/EU'
const EN_13120 = `EN 13120:2009+A1:2014 with EN 16433:2014 and EN 16434:2014 (references published by ${DECISION_2014_531}; figures as explained in retailer guidance)`

// EN 13120:2009+A1:2014 was released by CEN on 20 February 2014 (CEN news, published; BSI published it on
// 28 February 2014, and its reference reached the Official Journal with Decision 2014/531/EU on 15 August 2014).
// Clauses resting on the amended edition do not reach installations before its release (the earliest date: stricter).
const EDITION_A1: DateWindow = { fields: ['installedOn'], from: '2014-02-20' }

// Children aged 0–42 months may be present in these premises; offices and industrial premises are outside, where
// a product that does not meet the child-safety clauses is to be marked for premises without young children.
const IN_SCOPE: readonly PremisesType[] = ['home', 'rental_home', 'childcare', 'school', 'hotel', 'healthcare', 'shop']
const CHILD_FREE: readonly PremisesType[] = ['office', 'industrial']
const IN_SCOPE_WORDS = 'in premises where children aged 0–42 months may be present, installed from 20 February 2014'

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
  if (r.tensionDevice === true) return tensionDeviceWorks(r, cx, low)
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

/**
 * A tension device is a safety device only when it works: fixed to the wall or frame, not below the 600 mm
 * floor, holding the loop taut so it cannot be pulled out, and not operable by a child (EN 16434 devices;
 * Decision 2011/477/EU asks that safety devices resist operation by children).
 */
function tensionDeviceWorks(r: CoveringRecord, cx: ClauseContext, low: number): Finding {
  const floorMin = cx.t.absoluteMinMm!
  const clearMin = cx.t.noDeviceMinMm!
  const h = r.tensionDeviceHeightMm
  if (h !== null && h < floorMin) {
    return fail(
      cx,
      'tensionDeviceHeightMm',
      h,
      floorMin,
      'mm',
      `The tension device is fixed ${h} mm above the floor; no cord, chain or device holding it may come lower than ${floorMin} mm.`,
      `Refix the tension device at ${floorMin} mm or higher, shortening the loop to suit.`,
    )
  }
  if (r.deviceFixing === 'adhesive') {
    return fail(
      cx,
      'deviceFixing',
      'adhesive',
      null,
      null,
      'The tension device is stuck on with adhesive; it must be fixed to the wall or frame, and adhesive can let go under a child\'s pull.',
      'Refix it with screws into solid material (timber, plugs in masonry, anchors in plasterboard).',
    )
  }
  if (r.tensionDeviceHoldsTaut === false) {
    return fail(
      cx,
      'tensionDeviceHoldsTaut',
      false,
      true,
      null,
      `A tension device is fitted but the loop is slack: a loop can still be pulled out below ${clearMin} mm.`,
      'Refix the device where the loop is just taut, then ease it about 10 mm so it runs freely.',
    )
  }
  if (r.tensionDeviceTamperProof === false) {
    return fail(
      cx,
      'tensionDeviceTamperProof',
      false,
      true,
      null,
      'A child could take the cord or chain out of the tension device.',
      'Fit a tension device that locks the cord or chain in so it cannot be removed by hand.',
    )
  }
  const at = h === null ? '' : ` at ${h} mm`
  if (h === null) return missing(cx, 'tensionDeviceHeightMm', floorMin, 'mm', `The cord comes down to ${low} mm held by a tension device whose height was not recorded.`, 'Measure from the floor to the tension device and record it in mm.')
  if (r.deviceFixing === null) return missing(cx, 'deviceFixing', null, null, `The tension device${at} holds the cord, but what it is fixed into was not recorded.`, 'Record what the device is screwed into (timber, masonry plugs, plasterboard anchor, metal frame) or whether it is stuck on.')
  if (r.tensionDeviceHoldsTaut === null) return missing(cx, 'tensionDeviceHoldsTaut', true, null, `Not recorded whether the tension device${at} holds the loop taut.`, 'Pull the loop away from the device; record whether a loop can still be drawn out beyond the ~10 mm ease.')
  if (r.tensionDeviceTamperProof === null) return missing(cx, 'tensionDeviceTamperProof', true, null, `Not recorded whether a child could take the cord out of the tension device${at}.`, 'Try to lift the cord or chain out of the device by hand and record whether it stays in.')
  return pass(cx, 'tensionDeviceHoldsTaut', true, true, null, `The cord comes down to ${low} mm, held taut by a tension device fixed${at} that a child cannot undo.`)
}

function freeCordLength(r: CoveringRecord, cx: ClauseContext): Finding {
  const clearance = cx.t.clearanceMm!
  const unknownMax = cx.t.unknownHeightMaxMm!
  if (r.breakaway === true || r.tensionDevice === true) {
    return notApplicable(cx, 'A safety device is fitted; eu.cord-height decides how low the cord may come.')
  }
  const length = longestOf(r.freeCordLengthMm, r.operatingCordLengthMm)
  if (length === null) {
    return missing(cx, 'freeCordLengthMm', null, 'mm', 'The hanging length of the free cord was not recorded.', 'Measure the longest reachable free cord from the headrail down, in mm.')
  }
  const head = r.headHeightMm
  const limit = head !== null ? Math.max(0, head - clearance) : unknownMax
  const basisWords = head !== null ? `the headrail height (${head} mm) less ${clearance} mm` : `${unknownMax} mm, the figure used when the headrail height is not known`
  const field = r.freeCordLengthMm === length ? 'freeCordLengthMm' : 'operatingCordLengthMm'
  if (length > limit) {
    return fail(
      cx,
      field,
      length,
      limit,
      'mm',
      `The free cord hangs ${length} mm with no safety device; it may hang at most ${limit} mm (${basisWords}).`,
      `Shorten the cord to ${limit} mm or less, or fit a breakaway connector or a tension device.`,
    )
  }
  return pass(cx, field, length, limit, 'mm', `The free cord hangs ${length} mm, within ${limit} mm (${basisWords}).`)
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

function innerCordsEu(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.innerCordsReachable === false) return pass(cx, 'innerCordsReachable', false, false, null, 'The inner cords cannot be reached.')
  if (r.innerCordLoop === true) {
    return fail(
      cx,
      'innerCordLoop',
      true,
      false,
      null,
      `An inner cord can be pulled into a hazardous loop${r.innerCordStops === true ? ', although inner cord stops are fitted' : ''}.`,
      'Fit or adjust inner cord stops (EN 16434) just above the fully lowered bottom rail so no loop can be pulled out.',
    )
  }
  if (r.innerCordLoop === false) return pass(cx, 'innerCordLoop', false, false, null, 'No hazardous loop can be pulled out of the inner cords.')
  if (r.innerCordStops === true) return pass(cx, 'innerCordStops', true, true, null, 'Inner cord stops keep the inner cords from being pulled out into a loop.')
  if (r.innerCordStops === false) {
    return fail(
      cx,
      'innerCordStops',
      false,
      true,
      null,
      'The inner cords can be reached and nothing stops them being pulled out into a loop.',
      'Fit and adjust inner cord stops (EN 16434) just above the fully lowered bottom rail.',
    )
  }
  return missing(
    cx,
    'innerCordStops',
    true,
    null,
    'Not recorded whether inner cord stops are fitted or the inner cords are out of reach.',
    'With the covering lowered, pull an inner cord out between the slats or folds; record whether stops hold it and whether a hazardous loop comes out.',
  )
}

function cleatHeightEu(r: CoveringRecord, cx: ClauseContext): Finding {
  const min = cx.t.cleatMinMm!
  if (r.cleat !== true) return notApplicable(cx, 'No cleat is recorded as fitted.')
  const h = r.cleatHeightMm
  if (h === null) return missing(cx, 'cleatHeightMm', min, 'mm', 'A cleat is fitted but its height was not recorded.', 'Measure from the floor to the cleat and record it in mm.')
  if (h < min) {
    return fail(cx, 'cleatHeightMm', h, min, 'mm', `The cleat is ${h} mm above the floor; cleats and cord tidies sit at ${min} mm or higher.`, `Move the cleat to at least ${min} mm above the floor.`)
  }
  return pass(cx, 'cleatHeightMm', h, min, 'mm', `The cleat is ${h} mm above the floor, at least ${min} mm.`)
}

function childFreeWarning(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'childFreePremisesWarning',
    r.childFreePremisesWarning,
    'The product is marked for premises where young children are not present.',
    'A corded product fitted where young children are not expected carries no warning that it is for such premises.',
    'Ask the supplier for the product marked for child-free premises, or fit it to the child-safety clauses as in a home.',
    'Not recorded whether the product is marked for premises without young children.',
    'Check the product and its packaging for the warning that it is for premises where young children are not present, and record it.',
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
    appliesTo: { description: `corded coverings ${IN_SCOPE_WORDS}`, controls: corded, premises: IN_SCOPE, dates: EDITION_A1 },
    thresholds: [
      { name: 'noDeviceMinMm', value: 1500, unit: 'mm', note: 'at or above this, no safety device is needed' },
      {
        name: 'absoluteMinMm',
        value: 600,
        unit: 'mm',
        note: 'sources give 600 mm as the lowest point with a breakaway; Tautline applies it to every cord, tensioned loops included (stricter reading)',
      },
    ],
    note: 'Between 600 and 1500 mm a breakaway connector or a tension device is needed. A tension device counts only when it works: fixed to the wall or frame (not with adhesive) at 600 mm or higher, holding the loop taut, and not removable by a child. Stricter reading: no cord may come below 600 mm even with a tension device.',
    evaluate: cordHeight,
  },
  {
    id: 'eu.free-cord-length',
    title: 'Free cord without a device hangs no lower than 1500 mm',
    kind: 'requirement',
    source: { document: EN_13120, section: 'cord length without a safety device' },
    basis: 'secondary',
    appliesTo: { description: `free-hanging cords with no safety device, ${IN_SCOPE_WORDS}`, controls: ['free_cord'], premises: IN_SCOPE, dates: EDITION_A1 },
    note: 'Where free and operating cord lengths are both recorded, the longer decides.',
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
    appliesTo: { description: `roman and other rear-cord blinds, whatever the control, ${IN_SCOPE_WORDS}`, controls: controlTypes, products: ['roman', 'other'], premises: IN_SCOPE, dates: EDITION_A1 },
    thresholds: [{ name: 'rearSpacingMaxMm', value: 200, unit: 'mm', note: 'more than this needs a breakaway or cord stop' }],
    evaluate: rearCords,
  },
  {
    id: 'eu.warning-label',
    title: 'Warning label on the product',
    kind: 'requirement',
    source: { document: PSFG_GUIDANCE, section: 'warnings, instructions and safety devices supplied' },
    basis: 'published',
    appliesTo: { description: `coverings with operating cords ${IN_SCOPE_WORDS}`, controls: corded, premises: IN_SCOPE, dates: EDITION_A1 },
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
    appliesTo: { description: `coverings with operating cords ${IN_SCOPE_WORDS}`, controls: corded, premises: IN_SCOPE, dates: EDITION_A1 },
    thresholds: [],
    note: 'From 13 December 2024 the General Product Safety Regulation (EU) 2023/988 also asks for the manufacturer\'s name and contact details on the product or its packaging (recalled, article not checked).',
    evaluate: makerName,
  },
  {
    id: 'eu.installer-name',
    title: 'Professional installer named on the product',
    kind: 'requirement',
    source: { document: ES_SO, section: 'identification of the maker and installer' },
    basis: 'secondary',
    appliesTo: { description: `coverings with operating cords fitted by a professional installer ${IN_SCOPE_WORDS}`, controls: corded, premises: IN_SCOPE, dates: EDITION_A1 },
    thresholds: [],
    evaluate: installerName,
  },
  {
    id: 'eu.inner-cords',
    title: 'Inner cords held by stops, unable to form a hazardous loop',
    kind: 'requirement',
    source: { document: `EN 13120:2009+A1:2014 and EN 16434:2014 (inner cord stops), on the aims of ${DECISION_2011_477}`, section: 'inner cords (recital 3 of the Decision names inner cords; the standards\' clause numbers not seen)' },
    basis: 'secondary',
    appliesTo: {
      description: `products with inner lift cords (roman, venetian, cellular, pleated), whatever the control, ${IN_SCOPE_WORDS}`,
      controls: controlTypes,
      products: innerCorded,
      premises: IN_SCOPE,
      dates: EDITION_A1,
    },
    thresholds: [],
    note: 'Decision 2011/477/EU (published) names inner cords among the cords that can form hazardous loops; EN 16434 lists inner cord stops among safety devices. The standards themselves were not read, so the clause is secondary. Stops recorded do not excuse a hazardous inner loop that was also recorded.',
    evaluate: innerCordsEu,
  },
  {
    id: 'eu.cleat-height',
    title: 'Cleats and cord tidies at 1500 mm or higher',
    kind: 'requirement',
    source: { document: EN_13120, section: 'cleats, cord tidies and tension devices (heights as given in retailer guidance)' },
    basis: 'secondary',
    appliesTo: { description: `corded coverings with a cleat, ${IN_SCOPE_WORDS}`, controls: corded, premises: IN_SCOPE, dates: EDITION_A1 },
    thresholds: [{ name: 'cleatMinMm', value: 1500, unit: 'mm', note: 'retailer guidance places cleats "at about 1500 mm", where a cord needs no safety device; taken as the lowest height' }],
    note: 'A cord wound on a cleat within a child\'s reach can be unwound; the cleat sits where the cord itself would need no device.',
    evaluate: cleatHeightEu,
  },
  {
    id: 'eu.child-free-warning',
    title: 'Marked for premises without young children',
    kind: 'requirement',
    source: { document: 'EN 13120:2009+A1:2014', section: 'products for premises where children are not expected (clause number not seen)' },
    basis: 'memory',
    appliesTo: { description: 'corded coverings in offices and industrial premises, where children aged 0–42 months are not expected', controls: corded, premises: CHILD_FREE },
    thresholds: [],
    note: 'Recalled, not read: a product fitted where young children are not expected need not meet the child-safety clauses but carries a warning that it is for such premises.',
    evaluate: childFreeWarning,
  },
  {
    id: 'eu.breakaway-release',
    title: 'Breakaway release force: keep the test report',
    kind: 'advice',
    source: { document: 'EN 16434:2014 (release force as quoted by retailer and trade pages)', section: 'breakaway connectors' },
    basis: 'secondary',
    appliesTo: { description: 'cords with a breakaway connector', controls: corded, premises: IN_SCOPE },
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
    appliesTo: { description: 'coverings with operating cords', controls: corded, premises: IN_SCOPE },
    thresholds: [],
    evaluate: noKnots,
  },
  {
    id: 'advice.tassels-wands',
    title: 'Use wands, tassels or breakaways in place of loops',
    kind: 'advice',
    source: { document: 'Hackney Trading Standards and NSAI consumer advice', section: 'safer controls' },
    basis: 'published',
    appliesTo: { description: 'coverings worked by a loop', controls: looped, premises: IN_SCOPE },
    thresholds: [{ name: 'cordEndMinMm', value: 1600, unit: 'mm', note: 'NSAI: cords end at least 1.6 m above the floor' }],
    evaluate: tasselsAndWands,
  },
  // Shared advice, limited to the premises the child-safety clauses cover.
  ...sharedAdvice.map(c => ({ ...c, appliesTo: { ...c.appliesTo, premises: IN_SCOPE } })),
]

export const euRuleSet: RuleSet = {
  jurisdiction: 'EU',
  name: 'European Union and United Kingdom',
  version: 'EU-2026.12.1',
  scope: {
    description:
      'EN 13120:2009+A1:2014 (with EN 16433 and EN 16434) covers premises where children aged 0–42 months may be present (homes, hotels, hospitals, schools, shops, places of worship, nurseries); '
      + 'in offices and industrial premises only the child-free-premises marking is checked. The safety aims were set by Commission Decision 2011/477/EU; Implementing Decision 2014/531/EU '
      + 'published the standards\' references (certain clauses of EN 13120) under Directive 2001/95/EC, and was repealed on 9 October 2019 by Implementing Decision (EU) 2019/1698. '
      + 'From 13 December 2024 the General Product Safety Regulation (EU) 2023/988 replaced Directive 2001/95/EC. In the UK, compliance gives a presumption of conformity with the General Product Safety Regulations 2005.',
    premises: premisesTypes,
  },
  clauses: euClauses,
}
