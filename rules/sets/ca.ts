import { advise, fail, longestOf, loopPerimeter, missing, notApplicable, pass, requireFlag } from '../findings'
import { corded, innerCorded, looped, premisesTypes } from '../record'
import type { CoveringRecord } from '../record'
import type { Clause, ClauseContext, DateWindow, Finding, RuleSet } from '../types'
import { sharedAdvice } from './advice'

const SOR_2019_97 = 'Corded Window Coverings Regulations, SOR/2019-97'
const SOR_URL = 'https://laws-lois.justice.gc.ca/eng/regulations/SOR-2019-97/'

// In force 1 May 2021. The regulations bind sale, and the sale date is not recorded: a covering made or
// installed from that date is covered (stricter than testing the manufacture date alone).
const IN_FORCE_2021: DateWindow = { fields: ['manufacturedOn', 'installedOn'], from: '2021-05-01' }
const PRODUCT_SCOPE = 'corded window coverings made or installed from 1 May 2021; a cord is reachable whatever its height'
const SHIELD_NOTE = 'A cord shield that comes unassembled or comes off without a tool does not count.'

function freeEndCord(r: CoveringRecord, cx: ClauseContext): Finding {
  const max = cx.t.freeEndMaxMm!
  const force = cx.t.pullForceN!
  // The longest cord decides: on a free-cord control the operating cord is a free-end cord too.
  const length = r.control === 'free_cord' ? longestOf(r.freeCordLengthMm, r.operatingCordLengthMm) : r.freeCordLengthMm
  if (length === null) {
    if (r.control !== 'free_cord') return notApplicable(cx, 'No free-end cord is recorded on this covering.')
    return missing(
      cx,
      'freeCordLengthMm',
      max,
      'mm',
      'The length of the free-end cord was not recorded.',
      `Pull the longest reachable free-end cord with a force rising to ${force} N and record how far it reaches, in mm.`,
    )
  }
  const field = r.freeCordLengthMm === length ? 'freeCordLengthMm' : 'operatingCordLengthMm'
  if (length > max) {
    return fail(
      cx,
      field,
      length,
      max,
      'mm',
      `A reachable free-end cord is ${length} mm long; it may be no longer than ${max} mm when pulled at ${force} N, whatever its height.`,
      `Replace the control with a cordless, wand or motorised one, or with a cord no longer than ${max} mm. ${SHIELD_NOTE}`,
    )
  }
  return pass(cx, field, length, max, 'mm', `The longest reachable free-end cord is ${length} mm, within ${max} mm.`)
}

/** True when the only cords are inner cords recorded as out of reach (SOR/2019-97 s 1 "reachable"; s 4 keeps them so). */
function onlyUnreachableInnerCords(r: CoveringRecord): boolean {
  return !corded.includes(r.control) && innerCorded.includes(r.productType) && r.innerCordsReachable === false
}

const UNREACHABLE_INNER = 'The only cords are inner cords recorded as out of reach; s 4 requires them to stay so (see ca.unreachable-cords).'

function contactSpan(r: CoveringRecord, cx: ClauseContext): Finding {
  const max = cx.t.spanMaxMm!
  const force = cx.t.pullForceN!
  if (onlyUnreachableInnerCords(r)) return notApplicable(cx, UNREACHABLE_INNER)
  const span = r.cordSpanMm
  if (span === null && r.loopPerimeterMm !== null && r.loopPerimeterMm <= 2 * max) {
    // Two consecutive contact points split a loop into two spans, so no span of a loop of perimeter P exceeds P/2.
    return pass(
      cx,
      'loopPerimeterMm',
      r.loopPerimeterMm,
      2 * max,
      'mm',
      `The largest loop measures ${r.loopPerimeterMm} mm round, so no span between contact points can exceed ${max} mm.`,
    )
  }
  if (span === null) {
    return missing(
      cx,
      'cordSpanMm',
      max,
      'mm',
      'The longest span of reachable cord between two contact points was not recorded.',
      `Pull the reachable cord or chain at ${force} N and measure the longest length between two consecutive points where it touches the covering or a fixing, in mm.`,
    )
  }
  if (span > max) {
    return fail(
      cx,
      'cordSpanMm',
      span,
      max,
      'mm',
      `A reachable cord spans ${span} mm between two contact points; the limit is ${max} mm at ${force} N, whatever its height.`,
      `Replace the loop with a cordless, wand or motorised control, or one whose reachable spans are no longer than ${max} mm. A tension device does not shorten the span. ${SHIELD_NOTE}`,
    )
  }
  return pass(cx, 'cordSpanMm', span, max, 'mm', `The longest reachable span between contact points is ${span} mm, within ${max} mm.`)
}

function loopPerimeterClause(r: CoveringRecord, cx: ClauseContext): Finding {
  const max = cx.t.loopPerimeterMaxMm!
  const force = cx.t.pullForceN!
  if (onlyUnreachableInnerCords(r)) return notApplicable(cx, UNREACHABLE_INNER)
  const innerPullOut = innerCorded.includes(r.productType) && r.innerCordsReachable !== false ? r.innerLoopPullOutMm : null
  const perimeter = loopPerimeter(longestOf(r.loopPullOutMm, innerPullOut), r.loopPerimeterMm)
  if (perimeter === null) {
    return missing(
      cx,
      'loopPerimeterMm',
      max,
      'mm',
      'The size of the largest loop that exists or can be formed was not recorded.',
      `Pull at ${force} N to form or enlarge the largest loop you can, and record its perimeter in mm (or its pulled-out length in loopPullOutMm; ${max / 2} mm pulled out is a ${max} mm perimeter).`,
    )
  }
  const field = r.loopPerimeterMm !== null && perimeter === r.loopPerimeterMm
    ? 'loopPerimeterMm'
    : innerPullOut !== null && perimeter === innerPullOut * 2 ? 'innerLoopPullOutMm' : 'loopPullOutMm'
  if (perimeter > max) {
    return fail(
      cx,
      field,
      perimeter,
      max,
      'mm',
      `A loop with a perimeter of ${perimeter} mm can be formed; no loop may exceed ${max} mm when pulled at ${force} N, whatever its height.`,
      `Replace the control with a cordless, wand or motorised one, or make every reachable loop no larger than ${max} mm around. ${SHIELD_NOTE}`,
    )
  }
  return pass(cx, field, perimeter, max, 'mm', `The largest loop that can be formed has a perimeter of ${perimeter} mm, within ${max} mm.`)
}

function joinedCords(r: CoveringRecord, cx: ClauseContext): Finding {
  const max = cx.t.joinedMaxMm!
  const joined = r.jointFreeCordsMm
  if (joined === null) {
    return missing(
      cx,
      'jointFreeCordsMm',
      max,
      'mm',
      'Not recorded how far two reachable free-end cords reach when joined.',
      'Hold two reachable free-end cords together, pull them out flat and record the length in mm (record 0 if there is only one free end).',
    )
  }
  if (joined > max) {
    return fail(
      cx,
      'jointFreeCordsMm',
      joined,
      max,
      'mm',
      `Two free-end cords that can be joined reach ${joined} mm together; together they count as one cord of at most ${max} mm (a loop of at most ${2 * max} mm).`,
      `Shorten the free ends or join them permanently into one cord no longer than ${max} mm, or change to a cordless control.`,
    )
  }
  return pass(cx, 'jointFreeCordsMm', joined, max, 'mm', `Joined free-end cords reach ${joined} mm, within ${max} mm.`)
}

function warning(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'warningLabel',
    r.warningLabel,
    'A strangulation warning is on the product.',
    'The product carries no strangulation warning.',
    'Ask the supplier for the product warning label (English and French) and attach it; the warning must also be on the package, instructions and advertising.',
    'Not recorded whether the strangulation warning is on the product.',
    'Check the product for its strangulation warning label and record it.',
  )
}

function information(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'manufacturerLabel',
    r.manufacturerLabel,
    'The product is labelled with its maker and date of manufacture.',
    'The product does not show its model, date of manufacture, or the name and address of its maker or importer.',
    'Ask the supplier for a product label giving model, date of manufacture and the maker’s and importer’s names and addresses, in English and French.',
    'Not recorded whether the maker’s label is on the product.',
    'Look for a label with the model, date of manufacture and maker’s or importer’s name and address, and record it.',
  )
}

function bilingual(r: CoveringRecord, cx: ClauseContext): Finding {
  return requireFlag(
    cx,
    'bilingualInformation',
    r.bilingualInformation,
    'The product information and instructions are in English and French.',
    'The product information or instructions are not in both English and French.',
    'Ask the supplier for the label, instructions and warning in English and French.',
    'Not recorded whether the product information is in English and French.',
    'Check the label, instructions and warning for English and French text and record it.',
  )
}

function unreachableCords(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.innerCordsReachable !== false) return notApplicable(cx, 'The inner cords are not recorded as out of reach; ss 5 to 7 judge them.')
  return advise(
    cx,
    'innerCordsReachable',
    false,
    'The inner cords are out of reach; s 4 requires them to stay out of reach for the product\'s life, which only the supplier\'s testing can show.',
    `Keep the supplier's declaration for s 4 on file. ${SHIELD_NOTE}`,
  )
}

function smallParts(_r: CoveringRecord, cx: ClauseContext): Finding {
  return advise(
    cx,
    null,
    null,
    `Reachable small parts must stay attached under ${cx.t.smallPartHoldN} N; only a laboratory can test this.`,
    'Keep the supplier\'s declaration of conformity with SOR/2019-97 s 2 on file.',
  )
}

function lead(_r: CoveringRecord, cx: ClauseContext): Finding {
  return advise(
    cx,
    null,
    null,
    `Lead in external parts must not exceed ${cx.t.leadMaxMgPerKg} mg/kg; only a laboratory can test this.`,
    'Keep the supplier\'s declaration of conformity with SOR/2019-97 s 3 on file.',
  )
}

const pullForce = { name: 'pullForceN', value: 35, unit: 'N', note: 'the pull is raised to this force when measuring' } as const

export const caClauses: readonly Clause[] = [
  {
    id: 'ca.free-end-cord',
    title: 'Reachable free-end cord no longer than 22 cm',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 's 5', url: SOR_URL },
    basis: 'published',
    appliesTo: { description: PRODUCT_SCOPE, controls: corded, dates: IN_FORCE_2021 },
    thresholds: [{ name: 'freeEndMaxMm', value: 220, unit: 'mm', note: '22 cm' }, pullForce],
    note: 'Reachable means any person can touch it once installed, in any position of the covering (s 1): height does not make a cord unreachable.',
    evaluate: freeEndCord,
  },
  {
    id: 'ca.contact-span',
    title: 'Reachable cord spans no longer than 22 cm between contact points',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 's 6', url: SOR_URL },
    basis: 'published',
    appliesTo: {
      description: `cords with no free end (loops and inner lift cords), ${PRODUCT_SCOPE}`,
      controls: looped,
      innerCordProducts: true,
      dates: IN_FORCE_2021,
    },
    thresholds: [{ name: 'spanMaxMm', value: 220, unit: 'mm', note: '22 cm' }, pullForce],
    note: 'A recorded loop perimeter of 44 cm or less already bounds every span of that loop to 22 cm, so the span is not asked for then. Inner cords recorded as out of reach are left to s 4.',
    evaluate: contactSpan,
  },
  {
    id: 'ca.loop-perimeter',
    title: 'No loop larger than 44 cm around',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 's 7', url: SOR_URL },
    basis: 'published',
    appliesTo: {
      description: `every loop that exists or can be formed, inner lift cords included, on ${PRODUCT_SCOPE}`,
      controls: corded,
      innerCordProducts: true,
      dates: IN_FORCE_2021,
    },
    thresholds: [{ name: 'loopPerimeterMaxMm', value: 440, unit: 'mm', note: '44 cm; 22 cm pulled out flat' }, pullForce],
    note: 'When the perimeter and pulled-out lengths (operating and inner cords) are recorded, the larger loop they imply is checked: a loop pulled out L mm flat is at least 2L mm round.',
    evaluate: loopPerimeterClause,
  },
  {
    id: 'ca.joined-cords',
    title: 'Free-end cords that can be joined count as one',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 's 8 (reading from industry guidance)', url: SOR_URL },
    basis: 'secondary',
    appliesTo: { description: `coverings with free-end cords, ${PRODUCT_SCOPE}`, controls: ['free_cord'], dates: IN_FORCE_2021 },
    thresholds: [{ name: 'joinedMaxMm', value: 220, unit: 'mm', note: 'together; a loop of at most 44 cm' }],
    evaluate: joinedCords,
  },
  {
    id: 'ca.warning',
    title: 'Strangulation warning on the product',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 's 15', url: SOR_URL },
    basis: 'published',
    appliesTo: { description: PRODUCT_SCOPE, controls: corded, innerCordProducts: true, dates: IN_FORCE_2021 },
    thresholds: [],
    note: 'The warning is also required on the package, the instructions and advertising; only the product can be checked on site.',
    evaluate: warning,
  },
  {
    id: 'ca.information',
    title: 'Model, date and maker shown on the product',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 'information requirements: model, date of manufacture, name and address of manufacturer and importer (section number not seen)', url: SOR_URL },
    basis: 'secondary',
    appliesTo: { description: PRODUCT_SCOPE, controls: corded, innerCordProducts: true, dates: IN_FORCE_2021 },
    thresholds: [],
    note: 'The list of information is seen only in a testing laboratory\'s summary of SOR/2019-97 (SGS), so the basis is secondary.',
    evaluate: information,
  },
  {
    id: 'ca.bilingual-information',
    title: 'Information and instructions in English and French',
    kind: 'requirement',
    source: { document: SOR_2019_97, section: 'information and warning in both official languages (section number not seen)', url: SOR_URL },
    basis: 'secondary',
    appliesTo: { description: PRODUCT_SCOPE, controls: corded, innerCordProducts: true, dates: IN_FORCE_2021 },
    thresholds: [],
    note: 'Read from industry guidance and the shared rules reference, not the regulation\'s text.',
    evaluate: bilingual,
  },
  {
    id: 'ca.unreachable-cords',
    title: 'Cords out of reach stay out of reach (laboratory check)',
    kind: 'advice',
    source: { document: SOR_2019_97, section: 's 4', url: SOR_URL },
    basis: 'published',
    appliesTo: { description: `products with inner cords recorded as out of reach, ${PRODUCT_SCOPE}`, controls: corded, innerCordProducts: true, dates: IN_FORCE_2021 },
    thresholds: [],
    note: 'Whether a cord stays out of reach for the product\'s life is a design and test matter; Tautline points to the supplier\'s declaration.',
    evaluate: unreachableCords,
  },
  {
    id: 'ca.small-parts',
    title: 'Small parts stay attached (laboratory check)',
    kind: 'advice',
    source: { document: SOR_2019_97, section: 's 2', url: SOR_URL },
    basis: 'published',
    appliesTo: { description: PRODUCT_SCOPE, controls: corded, innerCordProducts: true },
    thresholds: [{ name: 'smallPartHoldN', value: 90, unit: 'N' }],
    note: 'Only a laboratory can test this; Tautline points to the supplier\'s declaration and never marks a record incomplete for it.',
    evaluate: smallParts,
  },
  {
    id: 'ca.lead',
    title: 'Lead in external parts (laboratory check)',
    kind: 'advice',
    source: { document: SOR_2019_97, section: 's 3', url: SOR_URL },
    basis: 'published',
    appliesTo: { description: PRODUCT_SCOPE, controls: corded, innerCordProducts: true },
    thresholds: [{ name: 'leadMaxMgPerKg', value: 90, unit: 'mg/kg' }],
    note: 'Only a laboratory can test this; Tautline points to the supplier\'s declaration and never marks a record incomplete for it.',
    evaluate: lead,
  },
  ...sharedAdvice,
]

export const caRuleSet: RuleSet = {
  jurisdiction: 'CA',
  name: 'Canada',
  version: 'CA-2026.12.1',
  scope: {
    description:
      'Binds manufacturers, importers and sellers of corded window coverings; nothing binds installers or landlords. Applies wherever the product is used.',
    premises: premisesTypes,
  },
  clauses: caClauses,
}
