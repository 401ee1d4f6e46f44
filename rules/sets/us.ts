import { fail, longestOf, missing, notApplicable, pass, requireFlag } from '../findings'
import { controlTypes, corded, innerCorded, looped, premisesTypes } from '../record'
import type { CoveringRecord } from '../record'
import type { Clause, ClauseContext, DateWindow, Finding, RuleSet } from '../types'
import { inchesToMm } from '../units'
import { sharedAdvice } from './advice'

const CFR_1120 = '16 CFR 1120 (87 FR 72873), making parts of ANSI/WCMA A100.1-2018 mandatory'
const CFR_1120_URL = 'https://www.ecfr.gov/current/title-16/chapter-II/subchapter-B/part-1120'
const A100_2018 = 'ANSI/WCMA A100.1-2018 (as described by CPSC business guidance and WCMA pages)'
const A100_2022 = 'ANSI/WCMA A100.1-2022 (as described by the WCMA/WCSC FAQ and trade summaries)'

// 16 CFR 1120 binds products made from 28 December 2022. A month-only date in December 2022 counts as inside (stricter).
const MANDATORY_FROM_2022: DateWindow = { fields: ['manufacturedOn'], from: '2022-12-28' }
// The 2018 edition took effect on 15 December 2018 (WCMA, "New Safety Standard": secondary; approved by ANSI on
// 8 January 2018). It does not reach products made before then; the 2022 edition replaced it from 1 June 2024.
const EDITION_2018: DateWindow = { fields: ['manufacturedOn'], from: '2018-12-15', until: '2024-06-01' }
const EDITION_2022: DateWindow = { fields: ['manufacturedOn'], from: '2024-06-01' }

/** 8 in, converted exactly (25.4 mm to the inch); "8 in or less" passes at 203.2 mm. */
function shortCordMm(cx: ClauseContext): number {
  return inchesToMm(cx.t.shortCordMaxIn!)
}

function stockOperatingCords(r: CoveringRecord, cx: ClauseContext): Finding {
  const maxIn = cx.t.shortCordMaxIn!
  const max = shortCordMm(cx)
  if (r.operatingCordsInaccessible === true) {
    return pass(cx, 'operatingCordsInaccessible', true, true, null, 'The operating cords cannot be reached (inaccessible operating cord, §4.3.1.3).')
  }
  if (looped.includes(r.control)) {
    // A continuous loop is neither cordless nor a short static cord: a stock loop complies only if it is inaccessible.
    if (r.operatingCordsInaccessible === false) {
      return fail(
        cx,
        'operatingCordsInaccessible',
        false,
        true,
        null,
        `A stock product has a continuous loop that can be reached; stock products may have only cordless, short (${maxIn} in or less) or inaccessible operating cords (§4.3.1).`,
        'Replace it with a cordless, motorised or short-cord stock product, or a custom product; a tension device added on site does not make a stock loop comply.',
      )
    }
    return missing(
      cx,
      'operatingCordsInaccessible',
      true,
      null,
      'A stock product with a continuous loop complies only if the loop cannot be reached; that was not recorded.',
      'Record whether the loop is enclosed so it cannot be reached (a rigid shroud or a built-in restraint that passed the accessibility test).',
    )
  }
  const length = longestOf(r.operatingCordLengthMm, r.freeCordLengthMm)
  if (length === null) {
    return missing(
      cx,
      'operatingCordLengthMm',
      max,
      'mm',
      'The length of the operating cord was not recorded.',
      'Measure the longest length of operating cord that can be reached, with the covering raised and lowered, in mm.',
    )
  }
  const field = r.operatingCordLengthMm === length ? 'operatingCordLengthMm' : 'freeCordLengthMm'
  if (length > max) {
    return fail(
      cx,
      field,
      length,
      max,
      'mm',
      `A stock product has an operating cord of ${length} mm; stock products must be cordless, have inaccessible cords, or a cord no longer than ${maxIn} in (${max} mm) in every position.`,
      'Replace it with a cordless, motorised or short-cord stock product, or a custom product; a device added on site does not make a stock product comply.',
    )
  }
  return pass(cx, field, length, max, 'mm', `The operating cord is ${length} mm, a short cord within ${maxIn} in (${max} mm).`)
}

function innerCords(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.innerCordsReachable === false) {
    return pass(cx, 'innerCordsReachable', false, false, null, 'The inner cords cannot be reached.')
  }
  if (r.innerCordLoop === true) {
    return fail(
      cx,
      'innerCordLoop',
      true,
      false,
      null,
      `An inner cord can be pulled into a hazardous loop${r.innerCordStops === true ? ', although inner cord stops are fitted' : ''}.`,
      'Adjust the inner cord stops just above the fully lowered bottom rail so no loop can be pulled out, or replace the product with one whose inner cords cannot be reached.',
    )
  }
  if (r.innerCordLoop === false) {
    return pass(cx, 'innerCordLoop', false, false, null, 'No hazardous loop can be pulled out of the inner cords.')
  }
  if (r.innerCordStops === true) {
    return pass(cx, 'innerCordStops', true, true, null, 'Inner cord stops keep the inner cords from being pulled out into a loop.')
  }
  if (r.innerCordStops === false) {
    return fail(
      cx,
      'innerCordStops',
      false,
      true,
      null,
      'The inner cords can be reached and nothing stops them being pulled out into a loop.',
      'Fit and adjust inner cord stops just above the fully lowered bottom rail, or replace the product with one whose inner cords cannot be reached.',
    )
  }
  return missing(
    cx,
    'innerCordStops',
    true,
    null,
    'Not recorded whether inner cord stops are fitted or the inner cords are out of reach.',
    'With the covering lowered, try to pull an inner cord out between the slats or folds; record whether stops hold it (innerCordStops), whether a loop a child\'s head could pass through comes out (innerCordLoop), or that the cords cannot be reached (innerCordsReachable).',
  )
}

function makerLabel(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'manufacturerLabel',
    r.manufacturerLabel,
    'The permanent maker’s label is on the headrail or roller tube.',
    'There is no permanent label with the maker’s or importer’s name, city and state and the month and year of manufacture; the CPSC treats this as a substantial product hazard.',
    'Ask the maker or importer for the permanent label and do not supply or fit the product without it.',
    'Not recorded whether the permanent maker’s label is on the headrail or roller tube.',
    'Look on or in the headrail or roller tube for the maker’s or importer’s name, city and state and the month and year of manufacture, and record it.',
  )
}

function custom2018CordLength(r: CoveringRecord, cx: ClauseContext): Finding {
  const pct = cx.t.defaultCordPercentOfHeight!
  const productHeight = r.productHeightMm
  if (productHeight === null) {
    return missing(cx, 'productHeightMm', null, 'mm', 'The product height was not recorded, so the default cord length cannot be worked out.', 'Measure the height of the covering in mm.')
  }
  const limit = (productHeight * pct) / 100
  const length = longestOf(r.operatingCordLengthMm, r.freeCordLengthMm)
  if (length === null) {
    return missing(cx, 'operatingCordLengthMm', limit, 'mm', 'The operating cord length was not recorded.', 'Measure the operating cord with the covering fully raised, in mm.')
  }
  if (length <= limit) {
    return pass(cx, 'operatingCordLengthMm', length, limit, 'mm', `The operating cord is ${length} mm, within the default ${pct} % of the product height (${limit} mm).`)
  }
  if (r.longerCordRequested === true) {
    return pass(cx, 'longerCordRequested', true, true, null, `The operating cord is ${length} mm, longer than the ${limit} mm default, at the buyer's request.`)
  }
  if (r.longerCordRequested === false) {
    return fail(
      cx,
      'operatingCordLengthMm',
      length,
      limit,
      'mm',
      `The operating cord is ${length} mm, longer than the default ${pct} % of the product height (${limit} mm), and no longer cord was asked for.`,
      `Shorten the operating cord to at most ${limit} mm.`,
    )
  }
  return missing(
    cx,
    'longerCordRequested',
    true,
    null,
    `The operating cord is ${length} mm, longer than the ${limit} mm default; the 2018 edition allows that only on request.`,
    'Record whether the buyer asked for a longer cord; if not, shorten it.',
  )
}

function custom2018LoopTension(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'tensionDevice',
    r.tensionDevice,
    'The continuous loop has a tension device.',
    'The continuous loop has no tension device.',
    'Fit the tension device supplied for the loop, fixed so it holds the loop taut.',
    'Not recorded whether the loop has a tension device.',
    'Record whether a tension device holds the loop.',
  )
}

function custom2022NoFreeCords(r: CoveringRecord, cx: ClauseContext): Finding {
  const maxIn = cx.t.shortCordMaxIn!
  const max = shortCordMm(cx)
  const length = longestOf(r.operatingCordLengthMm, r.freeCordLengthMm)
  if (length === null) {
    return missing(
      cx,
      'freeCordLengthMm',
      max,
      'mm',
      `Custom products made from 1 June 2024 may not have free-hanging operating cords; a short static cord of ${maxIn} in or less is allowed, and its length was not recorded.`,
      'Measure the longest reachable operating cord, with the covering raised and lowered, in mm.',
    )
  }
  const field = r.operatingCordLengthMm === length ? 'operatingCordLengthMm' : 'freeCordLengthMm'
  if (length <= max) {
    return pass(cx, field, length, max, 'mm', `The cord is ${length} mm, a short static cord of ${maxIn} in (${max} mm) or less, not a free-hanging cord.`)
  }
  return fail(
    cx,
    field,
    length,
    max,
    'mm',
    `A custom product made from 1 June 2024 has a free-hanging operating cord of ${length} mm; only a short static cord of ${maxIn} in (${max} mm) or less is allowed.`,
    'Replace the control with a cordless, wand or motorised one, or a loop with a factory-fitted tension device.',
  )
}

function custom2022TiltCords(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'freeTiltCord',
    r.freeTiltCord === null ? null : !r.freeTiltCord,
    'No free-hanging tilt cord: the slats are tilted another way.',
    'A free-hanging tilt cord is fitted; custom products made from 1 June 2024 may not have one.',
    'Replace the tilt cord with a tilt wand or a cordless tilt.',
    'Not recorded whether a free-hanging tilt cord is fitted.',
    'Record whether the slats are tilted by a hanging cord (freeTiltCord).',
  )
}

function custom2022Connectors(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'multiCordConnector',
    r.multiCordConnector === null ? null : !r.multiCordConnector,
    'No connector joins several operating cords.',
    'Several operating cords end in one connector or tassel.',
    'Replace the control with a cordless, wand or motorised one.',
    'Not recorded whether several operating cords end in one connector.',
    'Record whether two or more operating cords are joined in one connector or tassel (multiCordConnector).',
  )
}

function custom2022SlattedLoops(r: CoveringRecord, cx: ClauseContext): Finding {
  return fail(
    cx,
    'control',
    r.control,
    null,
    null,
    'Horizontal slatted products (venetian and similar) made to order from 1 June 2024 may not have a continuous cord loop or bead chain.',
    'Replace the control with a cordless, wand or motorised one.',
  )
}

function custom2022Tension(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.tensionDevice === false) {
    return fail(
      cx,
      'tensionDevice',
      false,
      true,
      null,
      'The loop has no tension device; custom products made from 1 June 2024 must work only with their factory-fitted tension device installed under tension.',
      'Fit the factory-supplied tension device under tension; if the product works without it, return it to the maker.',
    )
  }
  if (r.tensionDeviceFactoryFitted === false) {
    return fail(
      cx,
      'tensionDeviceFactoryFitted',
      false,
      true,
      null,
      'The tension device was not fitted to the loop by the maker; from 1 June 2024 it must come attached at the factory.',
      'Return the product to the maker for one with a factory-attached tension device.',
    )
  }
  if (r.operatesWithoutTensionDevice === true) {
    return fail(
      cx,
      'operatesWithoutTensionDevice',
      true,
      false,
      null,
      'The covering still works with its tension device not installed under tension; from 1 June 2024 it must not.',
      'Return the product to the maker: the tension device must disable the covering unless it is installed under tension.',
    )
  }
  if (r.tensionDevice === null) {
    return missing(cx, 'tensionDevice', true, null, 'Not recorded whether the loop has its tension device.', 'Record whether the factory-fitted tension device is installed under tension.')
  }
  if (r.tensionDeviceFactoryFitted === null) {
    return missing(cx, 'tensionDeviceFactoryFitted', true, null, 'Not recorded whether the tension device came attached from the maker.', 'Check that the tension device is permanently attached to the chain or cord as supplied, and record it.')
  }
  if (r.operatesWithoutTensionDevice === null) {
    return missing(
      cx,
      'operatesWithoutTensionDevice',
      false,
      null,
      'Not recorded whether the covering works without its tension device under tension.',
      'With the device not under tension, try the control; record whether the covering still raises or lowers.',
    )
  }
  return pass(cx, 'operatesWithoutTensionDevice', false, false, null, 'The loop has its factory-fitted tension device, and the covering works only with it under tension.')
}

function warningLabelUs(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'warningLabel',
    r.warningLabel,
    'The strangulation warning label is on the product.',
    'The product carries no strangulation warning label.',
    'Ask the maker for the warning label and attach it where the standard places it (headrail or bottom rail).',
    'Not recorded whether the warning label is on the product.',
    'Check the product for its strangulation warning label and record it.',
  )
}

function warningTagUs(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'swingTag',
    r.swingTag,
    'The warning tag is on the operating cord.',
    'The operating cord carries no warning tag.',
    'Ask the maker for the warning tag and attach it to the operating cord.',
    'Not recorded whether the warning tag is on the operating cord.',
    'Check the operating cord for its warning tag and record it.',
  )
}

function withdrawn(_r: CoveringRecord, cx: ClauseContext): Finding {
  return notApplicable(cx, 'Vacated on 12 September 2023; decides nothing.')
}

const EDITION_2022_SCOPE = 'custom products made on or after 1 June 2024'

export const usClauses: readonly Clause[] = [
  {
    id: 'us.stock-operating-cords',
    title: 'Stock products: cordless, inaccessible or short (8 in or less) cords only',
    kind: 'requirement',
    source: { document: CFR_1120, section: '1120.3(e); A100.1-2018 §4.3.1 (4.3.1.1 cordless, 4.3.1.2 short static cord, 4.3.1.3 inaccessible)', url: CFR_1120_URL },
    basis: 'published',
    appliesTo: { description: 'stock products with operating cords, made from 28 December 2022', controls: corded, madeTo: ['stock'], dates: MANDATORY_FROM_2022 },
    thresholds: [{ name: 'shortCordMaxIn', value: 8, unit: 'in', note: '8 in or less passes: 203.2 mm exactly (1 in = 25.4 mm)' }],
    note: 'Stock: completely or substantially fabricated before distribution and a specific SKU; cutting to size keeps a product stock (16 CFR 1120.2(f), adopting A100.1-2018 definition 5.02). A continuous loop is neither cordless nor a short static cord, so a stock loop complies only when inaccessible. Where free and operating cord lengths are both recorded, the longer decides.',
    evaluate: stockOperatingCords,
  },
  {
    id: 'us.inner-cords',
    title: 'Inner cords out of reach or unable to form a hazardous loop',
    kind: 'requirement',
    source: { document: CFR_1120, section: '1120.3(e) and (f); A100.1-2018 inner cord tests, Appendices C and D (per CPSC business guidance)', url: CFR_1120_URL },
    basis: 'published',
    appliesTo: {
      description: 'stock and custom products with inner lift cords (roman, venetian, cellular, pleated), made from 28 December 2022',
      controls: controlTypes,
      products: innerCorded,
      dates: MANDATORY_FROM_2022,
    },
    thresholds: [],
    note: 'Inner cord stops are a means, not a pass: a hazardous inner loop recorded fails whatever stops are fitted.',
    evaluate: innerCords,
  },
  {
    id: 'us.maker-label',
    title: 'Permanent maker’s label with month and year of manufacture',
    kind: 'requirement',
    source: { document: CFR_1120, section: '1120.3(e) and (f); "all finished window coverings" (CPSC 15(j) business guidance)', url: CFR_1120_URL },
    basis: 'published',
    appliesTo: {
      description: 'every finished stock and custom window covering, cordless, wand and motorised included, made from 28 December 2022',
      controls: controlTypes,
      dates: MANDATORY_FROM_2022,
    },
    thresholds: [],
    evaluate: makerLabel,
  },
  {
    id: 'us.warning-label',
    title: 'Strangulation warning label on the product',
    kind: 'requirement',
    source: { document: A100_2018, section: 'warning labels (section number not seen)' },
    basis: 'memory',
    appliesTo: {
      description: 'products with operating or inner cords made from 15 December 2018',
      controls: corded,
      innerCordProducts: true,
      dates: { fields: ['manufacturedOn'], from: '2018-12-15' },
    },
    thresholds: [],
    note: 'Recalled, not read: A100.1 requires permanent warning labels on corded products (the 2012 revision is reported to have added warnings on stock packaging). 16 CFR 1120 makes only the maker’s label mandatory.',
    evaluate: warningLabelUs,
  },
  {
    id: 'us.warning-tag',
    title: 'Warning tag on the operating cord',
    kind: 'requirement',
    source: { document: A100_2018, section: 'warning tag on operating cords (section number not seen)' },
    basis: 'memory',
    appliesTo: { description: 'products with operating cords made from 15 December 2018', controls: corded, dates: { fields: ['manufacturedOn'], from: '2018-12-15' } },
    thresholds: [],
    note: 'Recalled, not read: A100.1 requires a warning tag on operating cords.',
    evaluate: warningTagUs,
  },
  {
    id: 'us.custom-2018-cord-length',
    title: 'Custom free cords default to 40 % of product height',
    kind: 'requirement',
    source: { document: A100_2018, section: 'custom products: operating cord length' },
    basis: 'secondary',
    appliesTo: {
      description: 'custom products with a free-hanging operating cord, made from 15 December 2018 to 31 May 2024',
      controls: ['free_cord'],
      madeTo: ['custom'],
      dates: EDITION_2018,
    },
    thresholds: [{ name: 'defaultCordPercentOfHeight', value: 40, unit: '%', note: 'longer only at the buyer’s request' }],
    note: 'The 2018 edition took effect on 15 December 2018 (WCMA, secondary) and does not reach products made before it. Where free and operating cord lengths are both recorded, the longer decides.',
    evaluate: custom2018CordLength,
  },
  {
    id: 'us.custom-2018-loop-tension',
    title: 'Custom continuous loops have a tension device',
    kind: 'requirement',
    source: { document: A100_2018, section: 'custom products: continuous loops' },
    basis: 'secondary',
    appliesTo: { description: 'custom products with a continuous loop, made from 15 December 2018 to 31 May 2024', controls: looped, madeTo: ['custom'], dates: EDITION_2018 },
    thresholds: [],
    evaluate: custom2018LoopTension,
  },
  {
    id: 'us.custom-2022-no-free-cords',
    title: 'No free-hanging operating cords on custom products from June 2024; short static cords allowed',
    kind: 'requirement',
    source: { document: A100_2022, section: EDITION_2022_SCOPE },
    basis: 'secondary',
    appliesTo: {
      description: 'custom products with a free-hanging operating cord, made from 1 June 2024',
      controls: ['free_cord'],
      madeTo: ['custom'],
      dates: EDITION_2022,
    },
    thresholds: [{ name: 'shortCordMaxIn', value: 8, unit: 'in', note: 'a short static cord of 8 in (203.2 mm) or less is not a free-hanging cord' }],
    note: 'A trade association’s summary (secondary), not the standard’s text. Where free and operating cord lengths are both recorded, the longer decides.',
    evaluate: custom2022NoFreeCords,
  },
  {
    id: 'us.custom-2022-tilt-cords',
    title: 'No free-hanging tilt cords on custom products from June 2024',
    kind: 'requirement',
    source: { document: A100_2022, section: EDITION_2022_SCOPE },
    basis: 'secondary',
    appliesTo: {
      description: 'custom slatted and vertical products (which tilt), made from 1 June 2024, whatever the lift control',
      controls: controlTypes,
      products: ['venetian', 'vertical'],
      madeTo: ['custom'],
      dates: EDITION_2022,
    },
    thresholds: [],
    evaluate: custom2022TiltCords,
  },
  {
    id: 'us.custom-2022-multi-cord-connectors',
    title: 'No connectors joining several operating cords on custom products from June 2024',
    kind: 'requirement',
    source: { document: 'ANSI/WCMA A100.1-2022', section: `${EDITION_2022_SCOPE} (section not seen)` },
    basis: 'memory',
    appliesTo: { description: 'custom products with operating cords (not bead chains), made from 1 June 2024', controls: ['free_cord', 'cord_loop'], madeTo: ['custom'], dates: EDITION_2022 },
    thresholds: [],
    note: 'Recalled, not read: the trade summaries seen list free-hanging operating and tilt cords, loops on slatted products and tension devices, not connectors.',
    evaluate: custom2022Connectors,
  },
  {
    id: 'us.custom-2022-slatted-loops',
    title: 'No loops or bead chains on custom slatted products from June 2024',
    kind: 'requirement',
    source: { document: A100_2022, section: EDITION_2022_SCOPE },
    basis: 'secondary',
    appliesTo: {
      description: 'custom horizontal slatted products (venetian and similar) with a continuous loop, made from 1 June 2024',
      controls: looped,
      products: ['venetian'],
      madeTo: ['custom'],
      dates: EDITION_2022,
    },
    thresholds: [],
    evaluate: custom2022SlattedLoops,
  },
  {
    id: 'us.custom-2022-loop-tension',
    title: 'Custom loops from June 2024: factory-fitted tension device the product cannot work without',
    kind: 'requirement',
    source: { document: A100_2022, section: EDITION_2022_SCOPE },
    basis: 'secondary',
    appliesTo: { description: 'custom products with a continuous loop, made from 1 June 2024', controls: looped, madeTo: ['custom'], dates: EDITION_2022 },
    thresholds: [],
    note: 'The tension device is attached at the factory, and the covering must not work unless the device is installed under tension (trade summaries of the 2022 edition, secondary).',
    evaluate: custom2022Tension,
  },
  {
    id: 'us.cfr-1260-withdrawn',
    title: 'Custom operating cords rule (withdrawn)',
    kind: 'history',
    source: {
      document: '16 CFR 1260 (87 FR 73144), vacated by the D.C. Circuit, No. 22-1300',
      section: 'whole part',
      url: 'https://www.federalregister.gov/citation/87-FR-73144',
    },
    basis: 'published',
    appliesTo: { description: 'custom products (history only)', controls: corded, madeTo: ['custom'] },
    thresholds: [],
    note: 'Final rule of November 2022, stayed in January 2023 and vacated on 12 September 2023: it decides nothing and is kept as history.',
    evaluate: withdrawn,
  },
  ...sharedAdvice,
]

export const usRuleSet: RuleSet = {
  jurisdiction: 'US',
  name: 'United States',
  version: 'US-2026.12.1',
  scope: {
    description: 'Binds manufacturers, importers, fabricators and sellers of window coverings, wherever they are used.',
    premises: premisesTypes,
  },
  clauses: usClauses,
}
