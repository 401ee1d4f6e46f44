import { fail, loopPullOut, missing, notApplicable, pass, requireFlag } from '../findings'
import { controlTypes, corded, innerCorded, looped, premisesTypes } from '../record'
import type { CoveringRecord } from '../record'
import type { Clause, ClauseContext, DateWindow, Finding, RuleSet } from '../types'
import { sharedAdvice } from './advice'

const CFR_1120 = '16 CFR 1120 (87 FR 72873), making parts of ANSI/WCMA A100.1-2018 mandatory'
const CFR_1120_URL = 'https://www.ecfr.gov/current/title-16/chapter-II/subchapter-B/part-1120'
const A100_2018 = 'ANSI/WCMA A100.1-2018 (as described by CPSC business guidance)'
const A100_2022 = 'ANSI/WCMA A100.1-2022 (as described by the WCMA/WCSC FAQ)'

// 16 CFR 1120 binds products made from 28 December 2022. A month-only date in December 2022 counts as inside (stricter).
const MANDATORY_FROM_2022: DateWindow = { fields: ['manufacturedOn'], from: '2022-12-28' }
// The reference gives no start date for the 2018 edition: it is applied to every custom product made before 1 June 2024 (stricter).
const EDITION_2018: DateWindow = { fields: ['manufacturedOn'], until: '2024-06-01' }
const EDITION_2022: DateWindow = { fields: ['manufacturedOn'], from: '2024-06-01' }

function stockOperatingCords(r: CoveringRecord, cx: ClauseContext): Finding {
  const max = cx.t.shortCordMaxMm!
  const length
    = r.operatingCordLengthMm ?? (r.control === 'free_cord' ? r.freeCordLengthMm : loopPullOut(r.loopPullOutMm, r.loopPerimeterMm))
  if (length === null) {
    return missing(
      cx,
      'operatingCordLengthMm',
      max,
      'mm',
      'The length of the operating cord was not recorded.',
      'Measure the longest length of operating cord or chain that can be reached, with the covering raised and lowered, in mm.',
    )
  }
  if (length > max) {
    return fail(
      cx,
      'operatingCordLengthMm',
      length,
      max,
      'mm',
      `A stock product has an operating cord of ${length} mm; stock products must be cordless, have inaccessible cords, or a cord no longer than 8 in (${max} mm) in every position.`,
      'Replace it with a cordless, motorised or short-cord stock product, or a custom product; a device added on site does not make a stock product comply.',
    )
  }
  return pass(cx, 'operatingCordLengthMm', length, max, 'mm', `The operating cord is ${length} mm, a short cord within ${max} mm.`)
}

function innerCords(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.innerCordsReachable === false) {
    return pass(cx, 'innerCordsReachable', false, false, null, 'The inner cords cannot be reached.')
  }
  if (r.innerCordStops === true) {
    return pass(cx, 'innerCordStops', true, true, null, 'Inner cord stops keep the inner cords from being pulled into a loop.')
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
    'With the covering lowered, try to pull an inner cord out between the slats or folds; record whether stops hold it (innerCordStops) or the cords cannot be reached (innerCordsReachable).',
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
  const length = r.operatingCordLengthMm ?? r.freeCordLengthMm
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
  return fail(
    cx,
    'control',
    r.control,
    null,
    null,
    'Custom products made from 1 June 2024 may not have free-hanging operating cords.',
    'Replace the control with a cordless, wand or motorised one, or a loop with a factory-fitted tension device.',
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
  return requireFlag(
    cx,
    'tensionDevice',
    r.tensionDevice,
    'The loop has its tension device fitted under tension.',
    'The loop has no tension device; custom products made from 1 June 2024 must work only with their factory-fitted tension device installed under tension.',
    'Fit the factory-supplied tension device under tension; if the product works without it, return it to the maker.',
    'Not recorded whether the loop has its tension device.',
    'Record whether the factory-fitted tension device is installed under tension.',
  )
}

function withdrawn(_r: CoveringRecord, cx: ClauseContext): Finding {
  return notApplicable(cx, 'Vacated on 12 September 2023; decides nothing.')
}

export const usClauses: readonly Clause[] = [
  {
    id: 'us.stock-operating-cords',
    title: 'Stock products: cordless, inaccessible or short cords only',
    kind: 'requirement',
    source: { document: CFR_1120, section: '1120.3(e); A100.1-2018 §4.3.1', url: CFR_1120_URL },
    basis: 'published',
    appliesTo: { description: 'stock products with operating cords, made from 28 December 2022', controls: corded, madeTo: ['stock'], dates: MANDATORY_FROM_2022 },
    thresholds: [{ name: 'shortCordMaxMm', value: 203, unit: 'mm', note: '8 in is 203.2 mm; 203 mm is the stricter rounding' }],
    note: 'Stock: made before distribution to a set SKU; cutting to size keeps a product stock (16 CFR 1260.1 definition). A cord may also be inaccessible; record its reachable length as 0 then.',
    evaluate: stockOperatingCords,
  },
  {
    id: 'us.inner-cords',
    title: 'Inner cords out of reach or unable to form a loop',
    kind: 'requirement',
    source: { document: CFR_1120, section: '1120.3(e) and (f)', url: CFR_1120_URL },
    basis: 'published',
    appliesTo: {
      description: 'stock and custom products with inner lift cords (roman, venetian, cellular, pleated), made from 28 December 2022',
      controls: controlTypes,
      products: innerCorded,
      dates: MANDATORY_FROM_2022,
    },
    thresholds: [],
    evaluate: innerCords,
  },
  {
    id: 'us.maker-label',
    title: 'Permanent maker’s label with month and year of manufacture',
    kind: 'requirement',
    source: { document: CFR_1120, section: '1120.3(e) and (f)', url: CFR_1120_URL },
    basis: 'published',
    appliesTo: {
      description: 'stock and custom products with operating or inner cords, made from 28 December 2022',
      controls: corded,
      innerCordProducts: true,
      dates: MANDATORY_FROM_2022,
    },
    thresholds: [],
    evaluate: makerLabel,
  },
  {
    id: 'us.custom-2018-cord-length',
    title: 'Custom free cords default to 40 % of product height',
    kind: 'requirement',
    source: { document: A100_2018, section: 'custom products: operating cord length' },
    basis: 'secondary',
    appliesTo: {
      description: 'custom products with a free-hanging operating cord, made before 1 June 2024',
      controls: ['free_cord'],
      madeTo: ['custom'],
      dates: EDITION_2018,
    },
    thresholds: [{ name: 'defaultCordPercentOfHeight', value: 40, unit: '%', note: 'longer only at the buyer’s request' }],
    note: 'The reference gives no start date for the 2018 edition; Tautline applies it to every custom product made before 1 June 2024 (stricter).',
    evaluate: custom2018CordLength,
  },
  {
    id: 'us.custom-2018-loop-tension',
    title: 'Custom continuous loops have a tension device',
    kind: 'requirement',
    source: { document: A100_2018, section: 'custom products: continuous loops' },
    basis: 'secondary',
    appliesTo: { description: 'custom products with a continuous loop, made before 1 June 2024', controls: looped, madeTo: ['custom'], dates: EDITION_2018 },
    thresholds: [],
    evaluate: custom2018LoopTension,
  },
  {
    id: 'us.custom-2022-no-free-cords',
    title: 'No free-hanging operating cords on custom products from June 2024',
    kind: 'requirement',
    source: { document: A100_2022, section: 'custom products made on or after 1 June 2024' },
    basis: 'published',
    appliesTo: {
      description: 'custom products with a free-hanging operating cord, made from 1 June 2024',
      controls: ['free_cord'],
      madeTo: ['custom'],
      dates: EDITION_2022,
    },
    thresholds: [],
    note: 'Free-hanging tilt cords are also barred; the record has no tilt-cord field, so check them by eye.',
    evaluate: custom2022NoFreeCords,
  },
  {
    id: 'us.custom-2022-slatted-loops',
    title: 'No loops or bead chains on custom slatted products from June 2024',
    kind: 'requirement',
    source: { document: A100_2022, section: 'custom products made on or after 1 June 2024' },
    basis: 'published',
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
    title: 'Custom loops from June 2024 work only with a tension device',
    kind: 'requirement',
    source: { document: A100_2022, section: 'custom products made on or after 1 June 2024' },
    basis: 'published',
    appliesTo: { description: 'custom products with a continuous loop, made from 1 June 2024', controls: looped, madeTo: ['custom'], dates: EDITION_2022 },
    thresholds: [],
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
  version: 'US-2026.12.0',
  scope: {
    description: 'Binds manufacturers, importers, fabricators and sellers of window coverings, wherever they are used.',
    premises: premisesTypes,
  },
  clauses: usClauses,
}
