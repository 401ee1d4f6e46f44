import { advise, fail, loopPullOut, missing, notApplicable, pass, requireFlag } from '../findings'
import { corded, looped, premisesTypes } from '../record'
import type { CoveringRecord } from '../record'
import type { Clause, ClauseContext, DateWindow, Finding, RuleSet } from '../types'
import { sharedAdvice } from './advice'

const SAFETY_STANDARD_2014 = 'Competition and Consumer (Corded Internal Window Coverings) Safety Standard 2014'
const ACCC_GUIDE = 'ACCC, Corded internal window coverings — installation guide (November 2014)'
const NSW_SUMMARY = 'NSW Government, Blind and curtain safety (summary of the 2014 safety standard)'
const SUPPLY_REGULATIONS_2010
  = 'Trade Practices (Consumer Product Safety Standard — Corded Internal Window Coverings) Regulations 2010'

// The 2014 standard is not retrospective: it binds installations from 1 January 2015.
const INSTALLED_FROM_2015: DateWindow = { fields: ['installedOn'], from: '2015-01-01' }
// The 2010 regulations bind supply after 30 December 2010; the installation or manufacture date stands in for supply.
const SUPPLIED_FROM_2011: DateWindow = { fields: ['installedOn', 'manufacturedOn'], from: '2010-12-31' }

const INSTALLATION_SCOPE = 'corded coverings installed by a business from 1 January 2015 (installations before then are not covered: the standard is not retrospective)'

function loopReach(r: CoveringRecord, cx: ClauseContext): Finding {
  const loopMin = cx.t.loopMinMm!
  const zoneTop = cx.t.zoneTopMm!
  const pull = loopPullOut(r.loopPullOutMm, r.loopPerimeterMm)
  if (pull !== null && pull < loopMin) {
    return pass(cx, 'loopPullOutMm', pull, loopMin, 'mm', `The largest loop that can be pulled out is ${pull} mm, shorter than ${loopMin} mm.`)
  }
  const low = r.lowestCordPointMm
  if (low !== null && low > zoneTop) {
    return pass(cx, 'lowestCordPointMm', low, zoneTop, 'mm', `The lowest point of the cord is ${low} mm above the floor, above the ${zoneTop} mm zone.`)
  }
  const headInZone = r.headHeightMm !== null && r.headHeightMm <= zoneTop
  if (pull === null) {
    return missing(
      cx,
      'loopPullOutMm',
      loopMin,
      'mm',
      `The cord reaches ${low !== null ? `${low} mm above the floor` : headInZone ? 'within the zone' : 'an unrecorded height'} and the size of loop it can form was not recorded.`,
      'With the devices as fitted, pull out the largest loop you can from the cord or chain, lay it flat and record its length in mm.',
    )
  }
  if (low === null && !headInZone) {
    return missing(
      cx,
      'lowestCordPointMm',
      zoneTop,
      'mm',
      `A loop of ${pull} mm can be pulled out, but the height of the cord's lowest point was not recorded.`,
      'Measure from the floor to the lowest point any cord or chain reaches, with the devices as fitted.',
    )
  }
  const where = low !== null ? `its lowest point is ${low} mm above the floor` : `the headrail is only ${r.headHeightMm} mm above the floor`
  return fail(
    cx,
    'loopPullOutMm',
    pull,
    loopMin,
    'mm',
    `A loop of ${pull} mm can be pulled out and ${where}: no loop of ${loopMin} mm or longer may form within ${zoneTop} mm of the floor.`,
    r.tensionDevice === true
      ? `Tighten or move the tension device so the loop is held taut and no loop of ${loopMin} mm can be pulled out.`
      : `Fit a tension device fixed to the wall or frame that holds the loop taut, or shorten or raise the cord so its lowest point is above ${zoneTop} mm.`,
  )
}

function tensionDevice(r: CoveringRecord, cx: ClauseContext): Finding {
  const zoneTop = cx.t.zoneTopMm!
  const holdMin = cx.t.holdMinN!
  if (r.tensionDevice === false) return notApplicable(cx, 'No tension device is fitted; the loop clause decides whether one is needed.')
  if (r.tensionDevice === null) {
    if (r.lowestCordPointMm !== null && r.lowestCordPointMm > zoneTop) {
      return notApplicable(cx, `The cord stays above ${zoneTop} mm, so no tension device is needed.`)
    }
    const pull = loopPullOut(r.loopPullOutMm, r.loopPerimeterMm)
    if (pull !== null && pull < cx.t.loopMinMm!) {
      return notApplicable(cx, `No loop of ${cx.t.loopMinMm} mm can be pulled out, so no tension device is needed.`)
    }
    return missing(cx, 'tensionDevice', true, null, 'Not recorded whether a tension device holds the loop.', 'Record whether a tension device (cord guide) is fitted.')
  }
  const h = r.tensionDeviceHeightMm
  if (h !== null && h > zoneTop) {
    return pass(cx, 'tensionDeviceHeightMm', h, zoneTop, 'mm', `The tension device is fixed ${h} mm above the floor, above ${zoneTop} mm; no pull test is required there.`)
  }
  const hold = r.tensionDeviceHoldN
  const at = h !== null ? `at ${h} mm` : 'at an unrecorded height'
  if (hold !== null && hold < holdMin) {
    return fail(
      cx,
      'tensionDeviceHoldN',
      hold,
      holdMin,
      'N',
      `The tension device ${at} held only ${hold} N; below ${zoneTop} mm it must stay fixed under ${holdMin} N in any direction for 10 s.`,
      `Refix it with fixings that suit the wall (screws into timber, plugs in masonry, anchors in plasterboard) and repeat the ${holdMin} N pull test, or fix it above ${zoneTop} mm.`,
    )
  }
  if (r.tensionDeviceTamperProof === false) {
    return fail(
      cx,
      'tensionDeviceTamperProof',
      false,
      true,
      null,
      `A child could take the cord out of the tension device ${at}.`,
      'Fit a tension device that locks the cord in so it cannot be removed by hand.',
    )
  }
  if (hold !== null && r.tensionDeviceTamperProof === true) {
    return pass(cx, 'tensionDeviceHoldN', hold, holdMin, 'N', `The tension device ${at} held ${hold} N and a child cannot take the cord out.`)
  }
  if (h === null) {
    return missing(cx, 'tensionDeviceHeightMm', zoneTop, 'mm', 'The height of the tension device was not recorded.', 'Measure from the floor to the tension device and record it in mm.')
  }
  if (hold === null) {
    return missing(
      cx,
      'tensionDeviceHoldN',
      holdMin,
      'N',
      `The tension device is fixed at ${h} mm, within ${zoneTop} mm of the floor, and no pull-test figure was recorded.`,
      `Pull the fixed device with ${holdMin} N (about 7 kg) in each direction for 10 s and record the force it held.`,
    )
  }
  return missing(
    cx,
    'tensionDeviceTamperProof',
    true,
    null,
    'Not recorded whether a child could take the cord out of the tension device.',
    'Try to lift the cord out of the device by hand and record whether it stays in.',
  )
}

function cleatHeight(r: CoveringRecord, cx: ClauseContext): Finding {
  const minHeight = cx.t.cleatMinMm!
  if (r.cleat === false) return notApplicable(cx, 'No cleat is fitted.')
  if (r.cleat === null) {
    if (r.control !== 'free_cord') return notApplicable(cx, 'Continuous loops and bead chains are not wound on cleats.')
    return missing(cx, 'cleat', null, null, 'Not recorded whether a cleat secures the cord.', 'Record whether a cleat is fitted and, if so, its height above the floor.')
  }
  const h = r.cleatHeightMm
  if (h === null) return missing(cx, 'cleatHeightMm', minHeight, 'mm', 'A cleat is fitted but its height was not recorded.', 'Measure from the floor to the cleat and record it in mm.')
  if (h < minHeight) {
    return fail(
      cx,
      'cleatHeightMm',
      h,
      minHeight,
      'mm',
      `The cleat is ${h} mm above the floor; a child can unwind a cleat, so it must be at least ${minHeight} mm up.`,
      `Move the cleat to at least ${minHeight} mm above the floor.`,
    )
  }
  return pass(cx, 'cleatHeightMm', h, minHeight, 'mm', `The cleat is ${h} mm above the floor, at least ${minHeight} mm.`)
}

function installerLabel(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'installerLabel',
    r.installerLabel,
    'The installer\'s label with name and contact details is attached.',
    'No label gives the installer\'s name and contact details.',
    'Attach a label with the name and contact details of the person or business that installed the covering.',
    'Not recorded whether the installer\'s label is attached.',
    'Check for a label with the installer\'s name and contact details and record it.',
  )
}

function warningLabelKept(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'warningLabel',
    r.warningLabel,
    'The warning label is still attached.',
    'The warning label supplied with the covering is not attached.',
    'Put the supplied warning label back on the covering, or ask the supplier for a replacement.',
    'Not recorded whether the warning label is attached.',
    'Check the covering for its warning label and record it.',
  )
}

function swingTagKept(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'swingTag',
    r.swingTag,
    'The swing tag supplied on the cord is still attached.',
    'The swing tag supplied on the cord has been removed.',
    'Leave the swing tag on the cord; if it is lost, ask the supplier for a replacement and attach it.',
    'Not recorded whether the swing tag is still on the cord.',
    'Check the cord for its warning swing tag and record it.',
  )
}

function supplySwingTag(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'swingTag',
    r.swingTag,
    'The strangulation warning swing tag is on the cord.',
    'The cord carries no strangulation warning swing tag.',
    'Ask the supplier for the warning swing tag and instructions on securing the cord, and attach the tag to the cord.',
    'Not recorded whether the warning swing tag is on the cord.',
    'Check the cord for the supplier’s warning swing tag and record it.',
  )
}

function olderInstallation(r: CoveringRecord, cx: ClauseContext): Finding {
  return advise(
    cx,
    'installedOn',
    r.installedOn,
    'Installed before the 2014 standard applied, so its installation clauses do not bind this covering; a loop within reach is still a strangulation hazard.',
    `Offer to bring it up to the current standard: no loop of ${cx.t.loopMinMm} mm or longer within ${cx.t.zoneTopMm} mm of the floor.`,
  )
}

function fixingChoice(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.tensionDevice !== true && r.cleat !== true) return notApplicable(cx, 'No tension device or cleat is recorded as fitted.')
  return advise(
    cx,
    r.tensionDevice === true ? 'tensionDevice' : 'cleat',
    true,
    `Choose fixings so the device holds ${cx.t.holdMinN} N: screws into timber, plugs into masonry, anchors for plasterboard. Plastic cleats and guides can turn brittle.`,
    'Prefer steel or other metal cleats and cord guides, and install as the packaged instructions say.',
  )
}

export const auClauses: readonly Clause[] = [
  {
    id: 'au.loop-reach',
    title: 'No loop of 220 mm or more within 1600 mm of the floor',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: 's 6(1)(a)' },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [
      { name: 'loopMinMm', value: 220, unit: 'mm', note: 'a loop this long or longer is a hazard; one manufacturer manual prints 200 mm, the official figure is 220 mm' },
      {
        name: 'zoneTopMm',
        value: 1600,
        unit: 'mm',
        note: 'the ACCC guide says "less than 1600 mm", official summaries "at or less than 1,600 mm": stricter reading, a lowest point at 1600 mm is inside',
      },
    ],
    note: 'The loop is measured as fitted, with tension devices and cleats in use. Stricter reading of the boundary: a loop whose lowest point is exactly 1600 mm above the floor is inside the zone.',
    evaluate: loopReach,
  },
  {
    id: 'au.tension-device',
    title: 'A tension device fixed below 1600 mm holds 70 N and keeps the cord',
    kind: 'requirement',
    source: { document: ACCC_GUIDE, section: 'cord guides and tension devices fixed lower than 1600 mm' },
    basis: 'published',
    appliesTo: { description: `chain and cord loops, ${INSTALLATION_SCOPE}`, controls: looped, dates: INSTALLED_FROM_2015 },
    thresholds: [
      { name: 'holdMinN', value: 70, unit: 'N', note: 'in any direction for 10 s, about 7 kg' },
      { name: 'holdSeconds', value: 10, unit: 's' },
      { name: 'loopMinMm', value: 220, unit: 'mm', note: 'the device must hold the cord so no loop this long can form' },
      { name: 'zoneTopMm', value: 1600, unit: 'mm', note: 'a device at 1600 mm needs the pull test (stricter reading, as for the loop)' },
    ],
    note: 'The device must stay fixed to the wall or structure, hold the loop taut (see au.loop-reach) and keep a child from taking the cord out.',
    evaluate: tensionDevice,
  },
  {
    id: 'au.cleat-height',
    title: 'A cleat securing a cord is at least 1600 mm up',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: 'cleats (as summarised by productsafety.gov.au, Blinds, curtains and window fittings)' },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [{ name: 'cleatMinMm', value: 1600, unit: 'mm', note: 'no strength figure is set for cleats' }],
    evaluate: cleatHeight,
  },
  {
    id: 'au.installer-label',
    title: 'Installer\'s name and contact on a label',
    kind: 'requirement',
    source: { document: NSW_SUMMARY, section: 'installer\'s label' },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: installerLabel,
  },
  {
    id: 'au.warning-label-kept',
    title: 'Supplied warning label left attached',
    kind: 'requirement',
    source: { document: NSW_SUMMARY, section: 'warning labels and swing tags stay attached' },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: warningLabelKept,
  },
  {
    id: 'au.swing-tag-kept',
    title: 'Supplied swing tag left on the cord',
    kind: 'requirement',
    source: { document: NSW_SUMMARY, section: 'warning labels and swing tags stay attached' },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: swingTagKept,
  },
  {
    id: 'au.supply-swing-tag',
    title: 'Strangulation warning tag supplied on the cord',
    kind: 'requirement',
    source: { document: SUPPLY_REGULATIONS_2010, section: 'warnings on packaging, swing tag and instructions' },
    basis: 'published',
    appliesTo: {
      description: 'corded coverings supplied after 30 December 2010 (installation or manufacture date stands in for the supply date)',
      controls: corded,
      dates: SUPPLIED_FROM_2011,
    },
    thresholds: [],
    note: 'Published in general terms; the exact wording and label sizes were not seen, so Tautline checks only that the swing tag is on the cord.',
    evaluate: supplySwingTag,
  },
  {
    id: 'au.older-installation',
    title: 'Installed before 2015: offer to bring it up to the standard',
    kind: 'advice',
    source: { document: SAFETY_STANDARD_2014, section: 's 6(1)(a); not retrospective' },
    basis: 'published',
    appliesTo: {
      description: 'corded coverings installed before 1 January 2015',
      controls: corded,
      dates: { fields: ['installedOn'], until: '2015-01-01' },
    },
    thresholds: [
      { name: 'loopMinMm', value: 220, unit: 'mm' },
      { name: 'zoneTopMm', value: 1600, unit: 'mm' },
    ],
    evaluate: olderInstallation,
  },
  {
    id: 'au.fixing-choice',
    title: 'Fixings chosen to hold 70 N; metal preferred',
    kind: 'advice',
    source: { document: ACCC_GUIDE, section: 'fixing options' },
    basis: 'published',
    appliesTo: { description: 'coverings with a tension device or a cleat', controls: corded },
    thresholds: [{ name: 'holdMinN', value: 70, unit: 'N' }],
    evaluate: fixingChoice,
  },
  ...sharedAdvice,
]

export const auRuleSet: RuleSet = {
  jurisdiction: 'AU',
  name: 'Australia',
  version: 'AU-2026.12.0',
  scope: {
    description: 'Installation of corded internal window coverings by a business (2014 standard) and their supply (2010 regulations), in any premises.',
    premises: premisesTypes,
  },
  clauses: auClauses,
}
