import { advise, fail, missing, notApplicable, pass, requireFlag } from '../findings'
import { corded, innerCorded, premisesTypes } from '../record'
import type { CoveringRecord, RecordField } from '../record'
import type { Clause, ClauseContext, DateWindow, Evaluator, Finding, RuleSet } from '../types'
import { sharedAdvice } from './advice'

const SAFETY_STANDARD_2014 = 'Competition and Consumer (Corded Internal Window Coverings) Safety Standard 2014'
const ACCC_GUIDE = 'ACCC, Corded internal window coverings — installation guide (November 2014)'
// The Standard's own text was not in the sources read: its s 6(1)(a) is quoted by the ACCC guide; the other
// provisions below are cited to the Standard as restated by the ACCC guide and productsafety.gov.au, and their
// subsection numbers are not given because they were not seen.
const AS_RESTATED = 'provision restated by the ACCC installation guide (Nov 2014) and productsafety.gov.au; subsection number not seen'
const SUPPLY_REGULATIONS_2010
  = 'Trade Practices (Consumer Product Safety Standard — Corded Internal Window Coverings) Regulations 2010'

// The 2014 standard is not retrospective: it binds installations from 1 January 2015.
const INSTALLED_FROM_2015: DateWindow = { fields: ['installedOn'], from: '2015-01-01' }
// The 2010 regulations bind supply after 30 December 2010; the installation or manufacture date stands in for supply.
const SUPPLIED_FROM_2011: DateWindow = { fields: ['installedOn', 'manufacturedOn'], from: '2010-12-31' }

const INSTALLATION_SCOPE = 'corded coverings, and products with inner or rear cords, installed by a business from 1 January 2015 (installations before then are not covered: the standard is not retrospective)'

/**
 * The 2014 standard binds installation supplied in trade or commerce (productsafety.gov.au and WA Consumer
 * Protection: "installation services"); an occupier fitting their own covering is outside it. Not recorded counts
 * as installed by a business (stricter).
 */
function byBusiness(evaluate: Evaluator): Evaluator {
  return (r, cx) =>
    r.installedByBusiness === false
      ? notApplicable(cx, 'Not installed by a business: the 2014 standard binds installation supplied in trade or commerce.')
      : evaluate(r, cx)
}

interface Loop { field: RecordField, value: number | null }

/**
 * The loops a child could form on this covering, as pull-outs: the operating cord or chain (corded controls) and
 * the inner or rear cords (roman, venetian, cellular, pleated, unless they cannot be reached). A recorded
 * perimeter only bounds the pull-out from above: when half of it is already short of the limit the loop passes;
 * otherwise the pull-out itself must be measured (a tensioned chain keeps its perimeter but cannot be pulled out).
 */
function loopsOf(r: CoveringRecord, loopMin: number): Loop[] {
  const loops: Loop[] = []
  if (corded.includes(r.control)) {
    if (r.loopPullOutMm !== null) loops.push({ field: 'loopPullOutMm', value: r.loopPullOutMm })
    else if (r.loopPerimeterMm !== null && r.loopPerimeterMm / 2 < loopMin) loops.push({ field: 'loopPerimeterMm', value: r.loopPerimeterMm / 2 })
    else loops.push({ field: 'loopPullOutMm', value: null })
  }
  if (innerCorded.includes(r.productType) && r.innerCordsReachable !== false) loops.push({ field: 'innerLoopPullOutMm', value: r.innerLoopPullOutMm })
  return loops
}

function loopReach(r: CoveringRecord, cx: ClauseContext): Finding {
  const loopMin = cx.t.loopMinMm!
  const zoneTop = cx.t.zoneTopMm!
  const low = r.lowestCordPointMm
  if (low !== null && low > zoneTop) {
    return pass(cx, 'lowestCordPointMm', low, zoneTop, 'mm', `The lowest point of any cord is ${low} mm above the floor, above the ${zoneTop} mm zone.`)
  }
  const loops = loopsOf(r, loopMin)
  if (loops.length === 0) return notApplicable(cx, 'No operating cord and no reachable inner cords.')
  let longest: Loop | null = null
  let unmeasured: Loop | null = null
  for (const l of loops) {
    if (l.value === null) unmeasured ??= l
    else if (longest === null || l.value > longest.value!) longest = l
  }
  const headInZone = r.headHeightMm !== null && r.headHeightMm <= zoneTop
  const inner = (l: Loop) => (l.field === 'innerLoopPullOutMm' ? 'inner or rear cord' : 'operating cord or chain')
  if (longest !== null && longest.value! >= loopMin) {
    const pull = longest.value!
    if (low === null && !headInZone) {
      return missing(
        cx,
        'lowestCordPointMm',
        zoneTop,
        'mm',
        `A loop of ${pull} mm can be pulled out of the ${inner(longest)}, but the height of the cord's lowest point was not recorded.`,
        'Measure from the floor to the lowest point any cord or chain reaches, with the devices as fitted.',
      )
    }
    const where = low !== null ? `its lowest point is ${low} mm above the floor` : `the headrail is only ${r.headHeightMm} mm above the floor`
    return fail(
      cx,
      longest.field,
      pull,
      loopMin,
      'mm',
      `A loop of ${pull} mm can be pulled out of the ${inner(longest)} and ${where}: no loop of ${loopMin} mm or longer may form within ${zoneTop} mm of the floor.`,
      longest.field === 'innerLoopPullOutMm'
        ? `Fit or adjust the inner cord stops so no loop of ${loopMin} mm can be pulled out, or replace the product with one whose inner cords cannot be reached.`
        : r.tensionDevice === true
          ? `Tighten or move the tension device so the loop is held taut and no loop of ${loopMin} mm can be pulled out.`
          : `Fit a tension device fixed to the wall or frame that holds the loop taut, or shorten or raise the cord so its lowest point is above ${zoneTop} mm.`,
    )
  }
  if (unmeasured !== null) {
    const innerLoop = unmeasured.field === 'innerLoopPullOutMm'
    return missing(
      cx,
      unmeasured.field,
      loopMin,
      'mm',
      `The cord reaches ${low !== null ? `${low} mm above the floor` : headInZone ? 'within the zone' : 'an unrecorded height'} and the loop the ${inner(unmeasured)} can form was not recorded.`,
      innerLoop
        ? 'With the covering fully lowered, pull an inner or rear cord out as far as it comes, lay the loop flat and record its length in mm (0 if none comes out).'
        : 'With the devices as fitted, pull the cord or chain out as far as it comes, lay the loop flat and record its length in mm (a recorded perimeter is not the pull-out).',
    )
  }
  const pull = longest!.value!
  return pass(cx, longest!.field, pull, loopMin, 'mm', `The largest loop that can be pulled out is ${pull} mm, shorter than ${loopMin} mm.`)
}

function tensionDevice(r: CoveringRecord, cx: ClauseContext): Finding {
  const zoneTop = cx.t.zoneTopMm!
  const holdMin = cx.t.holdMinN!
  const loopMin = cx.t.loopMinMm!
  if (r.tensionDevice === false) return notApplicable(cx, 'No cord guide or tension device is fitted; the loop clause decides whether one is needed.')
  if (r.tensionDevice === null) {
    if (r.lowestCordPointMm !== null && r.lowestCordPointMm > zoneTop) {
      return notApplicable(cx, `The cord stays above ${zoneTop} mm, so no cord guide is needed.`)
    }
    if (r.loopPullOutMm !== null && r.loopPullOutMm < loopMin) {
      return notApplicable(cx, `No loop of ${loopMin} mm can be pulled out, so no cord guide is needed.`)
    }
    return missing(cx, 'tensionDevice', true, null, 'Not recorded whether a cord guide or tension device holds the cord.', 'Record whether a cord guide or tension device is fitted, on a loop or a free cord.')
  }
  const h = r.tensionDeviceHeightMm
  if (h !== null && h > zoneTop) {
    return pass(cx, 'tensionDeviceHeightMm', h, zoneTop, 'mm', `The cord guide is fixed ${h} mm above the floor, above ${zoneTop} mm; no pull test is required there.`)
  }
  const hold = r.tensionDeviceHoldN
  const pull = r.loopPullOutMm
  const at = h !== null ? `at ${h} mm` : 'at an unrecorded height'
  if (hold !== null && hold < holdMin) {
    return fail(
      cx,
      'tensionDeviceHoldN',
      hold,
      holdMin,
      'N',
      `The cord guide ${at} held only ${hold} N; below ${zoneTop} mm it must stay fixed under ${holdMin} N in any direction for 10 s.`,
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
      `A child could take the cord out of the cord guide ${at}.`,
      'Fit a cord guide that locks the cord in so it cannot be removed by hand.',
    )
  }
  if (pull !== null && pull >= loopMin) {
    return fail(
      cx,
      'loopPullOutMm',
      pull,
      loopMin,
      'mm',
      `The cord guide ${at} leaves a loop of ${pull} mm that can be pulled out; below ${zoneTop} mm it must hold the cord so no loop of ${loopMin} mm can form.`,
      'Refix the guide lower or tighten it so the cord is held taut, then ease it about 10 mm so it still runs.',
    )
  }
  if (hold !== null && r.tensionDeviceTamperProof === true && pull !== null) {
    return pass(cx, 'tensionDeviceHoldN', hold, holdMin, 'N', `The cord guide ${at} held ${hold} N, keeps the cord in and leaves no loop of ${loopMin} mm.`)
  }
  if (h === null && (hold === null || r.tensionDeviceTamperProof !== true)) {
    return missing(cx, 'tensionDeviceHeightMm', zoneTop, 'mm', 'The height of the cord guide was not recorded.', 'Measure from the floor to the cord guide and record it in mm.')
  }
  if (hold === null) {
    return missing(
      cx,
      'tensionDeviceHoldN',
      holdMin,
      'N',
      `The cord guide is fixed ${at}, within ${zoneTop} mm of the floor, and no pull-test figure was recorded.`,
      `Pull the fixed device with ${holdMin} N (about 7 kg) in each direction for 10 s and record the force it held.`,
    )
  }
  if (r.tensionDeviceTamperProof === null) {
    return missing(
      cx,
      'tensionDeviceTamperProof',
      true,
      null,
      'Not recorded whether a child could take the cord out of the cord guide.',
      'Try to lift the cord out of the device by hand and record whether it stays in.',
    )
  }
  return missing(
    cx,
    'loopPullOutMm',
    loopMin,
    'mm',
    `The cord guide is fixed ${at}; it was not recorded how far the cord can still be pulled out.`,
    'With the guide fixed, pull the cord or chain out as far as it comes, lay the loop flat and record its length in mm.',
  )
}

function installedPerInstructions(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'installedPerInstructions',
    r.installedPerInstructions,
    'Installed as the instructions on the retail packaging say.',
    'Not installed as the instructions on the retail packaging say.',
    'Refit the covering and its safety devices as the packaged instructions say.',
    'Not recorded whether the covering was installed as its packaged instructions say.',
    'Check the installation against the instructions on the product’s retail packaging and record it.',
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
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, innerCordProducts: true, dates: INSTALLED_FROM_2015 },
    thresholds: [
      { name: 'loopMinMm', value: 220, unit: 'mm', note: 'a loop this long or longer is a hazard; one manufacturer manual prints 200 mm, the official figure is 220 mm' },
      {
        name: 'zoneTopMm',
        value: 1600,
        unit: 'mm',
        note: 'the ACCC guide says "less than 1600 mm", official summaries "at or less than 1,600 mm": stricter reading, a lowest point at 1600 mm is inside',
      },
    ],
    note: 'The loop is what a child can pull out (loopPullOutMm), measured as fitted, with tension devices and cleats in use; a recorded perimeter only bounds it from above. "A loose cord" includes inner and rear cords that can be pulled into a loop (innerLoopPullOutMm). Stricter reading of the boundary: a loop whose lowest point is exactly 1600 mm above the floor is inside the zone.',
    evaluate: byBusiness(loopReach),
  },
  {
    id: 'au.tension-device',
    title: 'A cord guide or tension device fixed below 1600 mm holds 70 N, keeps the cord and leaves no 220 mm loop',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: `cord guides installed lower than 1600 mm (${AS_RESTATED})` },
    basis: 'published',
    appliesTo: { description: `every cord guide or tension device, on loops and free cords alike, ${INSTALLATION_SCOPE}`, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [
      { name: 'holdMinN', value: 70, unit: 'N', note: 'in any direction for 10 s, about 7 kg' },
      { name: 'holdSeconds', value: 10, unit: 's' },
      { name: 'loopMinMm', value: 220, unit: 'mm', note: 'the device must hold the cord so no loop this long can form' },
      { name: 'zoneTopMm', value: 1600, unit: 'mm', note: 'a device at 1600 mm needs the pull test (stricter reading, as for the loop)' },
    ],
    note: 'Applies to any cord guide or tension device fixed lower than 1600 mm, whether it holds a loop or a free cord (ACCC installation guide). It must stay fixed to the wall or structure under 70 N, hold the cord so no 220 mm loop can form, and keep a child from taking the cord out.',
    evaluate: byBusiness(tensionDevice),
  },
  {
    id: 'au.cleat-height',
    title: 'A cleat securing a cord is at least 1600 mm up',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: `cleats (${AS_RESTATED})` },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [{ name: 'cleatMinMm', value: 1600, unit: 'mm', note: 'no strength figure is set for cleats' }],
    evaluate: byBusiness(cleatHeight),
  },
  {
    id: 'au.installed-per-instructions',
    title: 'Installed as the packaged instructions say',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: `installation in accordance with the instructions on the retail packaging (${AS_RESTATED})` },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, innerCordProducts: true, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: byBusiness(installedPerInstructions),
  },
  {
    id: 'au.installer-label',
    title: 'Installer\'s name and contact on a label',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: `installer's label (${AS_RESTATED}; also NSW Government, Blind and curtain safety)` },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: byBusiness(installerLabel),
  },
  {
    id: 'au.warning-label-kept',
    title: 'Supplied warning label left attached',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: `warning labels and swing tags stay attached (${AS_RESTATED}; also NSW Government, Blind and curtain safety)` },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: byBusiness(warningLabelKept),
  },
  {
    id: 'au.swing-tag-kept',
    title: 'Supplied swing tag left on the cord',
    kind: 'requirement',
    source: { document: SAFETY_STANDARD_2014, section: `warning labels and swing tags stay attached (${AS_RESTATED}; also NSW Government, Blind and curtain safety)` },
    basis: 'published',
    appliesTo: { description: INSTALLATION_SCOPE, controls: corded, dates: INSTALLED_FROM_2015 },
    thresholds: [],
    evaluate: byBusiness(swingTagKept),
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
  version: 'AU-2026.12.1',
  scope: {
    description:
      'Installation of corded internal window coverings supplied in trade or commerce (2014 standard, from 1 January 2015) and their supply (2010 regulations). '
      + 'Premises: the Standard\'s own application section was not seen. Official summaries (productsafety.gov.au; WA Consumer Protection) describe installation services with no limit to dwellings; '
      + 'the ACCC\'s 2013 consultation proposed domestic dwellings and one trade page says residential buildings (secondary). Tautline checks every premises (stricter) until the Standard\'s text is read.',
    premises: premisesTypes,
  },
  clauses: auClauses,
}
