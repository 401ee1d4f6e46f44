import { z } from 'zod'

// The enum lists are exported as const arrays so the app can build its pickers from the same values.
/** NUL, the other C0 controls and DEL: never part of a reference or name. */
// eslint-disable-next-line no-control-regex
export const CONTROL_CHARACTERS = /[\u0000-\u001F\u007F]/

export const jurisdictions = ['AU', 'CA', 'US', 'EU'] as const
export type Jurisdiction = (typeof jurisdictions)[number]

export const premisesTypes = [
  'home',
  'rental_home',
  'childcare',
  'school',
  'hotel',
  'healthcare',
  'shop',
  'office',
  'industrial',
] as const
export type PremisesType = (typeof premisesTypes)[number]

// `venetian` stands for every horizontal slatted product.
export const productTypes = [
  'roller',
  'roman',
  'venetian',
  'vertical',
  'cellular',
  'pleated',
  'panel',
  'curtain',
  'other',
] as const
export type ProductType = (typeof productTypes)[number]

export const controlTypes = ['chain_loop', 'cord_loop', 'free_cord', 'wand', 'motorised', 'cordless'] as const
export type ControlType = (typeof controlTypes)[number]

export const madeToValues = ['stock', 'custom'] as const

/** What a tension device or cleat is screwed (or stuck) into. */
export const deviceFixings = ['timber', 'masonry_plugs', 'plasterboard_anchor', 'metal_frame', 'adhesive'] as const
export type DeviceFixing = (typeof deviceFixings)[number]
export type MadeTo = (typeof madeToValues)[number]

/** Controls that hang an operating cord or chain within reach. */
export const corded: readonly ControlType[] = ['chain_loop', 'cord_loop', 'free_cord']
/** Controls that form a continuous loop. */
export const looped: readonly ControlType[] = ['chain_loop', 'cord_loop']
/** Products whose lift cords run through the fabric or slats (inner cords), whatever the control. */
export const innerCorded: readonly ProductType[] = ['roman', 'venetian', 'cellular', 'pleated']

const MAX_LENGTH_MM = 20_000 // taller than any room a covering is fitted in; larger is a typing slip
const MAX_FORCE_N = 5_000 // far beyond any pull test; larger is a typing slip

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]

function isRealDate(text: string, dayRequired: boolean): boolean {
  const match = /^(\d{4})-(\d{2})(?:-(\d{2}))?$/.exec(text)
  if (!match) return false
  const year = Number(match[1])
  const month = Number(match[2])
  if (year < 1900 || year > 2100 || month < 1 || month > 12) return false
  if (match[3] === undefined) return !dayRequired
  const day = Number(match[3])
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0
  const last = month === 2 && !leap ? 28 : DAYS_IN_MONTH[month - 1]!
  return day >= 1 && day <= last
}

// Cross-field checks run even when a field failed its own check; they compare only sound values.
function isLength(v: unknown): v is number {
  return typeof v === 'number' && v >= 0 && v <= MAX_LENGTH_MM
}

const lengthMm = (max = MAX_LENGTH_MM) =>
  z
    .number({ error: 'must be a number of millimetres, or null when not recorded' })
    .min(0, `must be at least 0 mm`)
    .max(max, `must be at most ${max} mm`)
    .nullable()
    .default(null)

const forceN = () =>
  z
    .number({ error: 'must be a force in newtons, or null when not recorded' })
    .min(0, 'must be at least 0 N')
    .max(MAX_FORCE_N, `must be at most ${MAX_FORCE_N} N`)
    .nullable()
    .default(null)

const flag = () => z.boolean({ error: 'must be true, false, or null when not recorded' }).nullable().default(null)

const enumOf = <T extends readonly [string, ...string[]]>(values: T) =>
  z.enum(values, { error: issue => (issue.input === undefined ? 'is required' : `must be one of: ${values.join(', ')}`) })

const installDate = z
  .string({ error: 'must be a date written YYYY-MM-DD' })
  .refine(v => isRealDate(v, true), 'must be a real date written YYYY-MM-DD')
  .nullable()
  .default(null)

const manufactureDate = z
  .string({ error: 'must be a date written YYYY-MM or YYYY-MM-DD' })
  .refine(v => isRealDate(v, false), 'must be a real date written YYYY-MM or YYYY-MM-DD')
  .nullable()
  .default(null)

/**
 * One covering as recorded on site. Lengths are millimetres measured from the floor or along the cord;
 * a number or boolean that is null was not recorded. Unknown keys are dropped.
 */
export const coveringRecordSchema = z
  .object({
    ref: z.string({ error: issue => (issue.input === undefined ? 'is required' : 'must be the covering reference (text)') }).trim().min(1, 'must not be empty').max(200, 'must be at most 200 characters')
      .refine(v => !CONTROL_CHARACTERS.test(v), 'must not hold control characters'),
    jurisdiction: enumOf(jurisdictions),
    premises: enumOf(premisesTypes),
    installedOn: installDate,
    manufacturedOn: manufactureDate,
    madeTo: enumOf(madeToValues).nullable().default(null),
    productType: enumOf(productTypes),
    control: enumOf(controlTypes),
    /** Top of the headrail above the floor. */
    headHeightMm: lengthMm(),
    productHeightMm: lengthMm(),
    /** Lowest point any cord or chain reaches above the floor, with devices as fitted. */
    lowestCordPointMm: lengthMm(),
    /**
     * Pull-out of the operating cord or chain: what a child can draw out. With the tension device, cord guide and
     * cleat as fitted, take the cord or chain at its lowest reachable point, pull it out by hand as far as it comes
     * and lay the loop flat; record its length from the fold to where its two sides meet (or reach the device or
     * headrail). A chain held taut by a working tension device gives only a few mm (the ease), whatever its length.
     * AU s 6(1)(a) (220 mm) and the tension-device clauses read this figure.
     */
    loopPullOutMm: lengthMm(),
    /**
     * Perimeter of the largest loop that exists or can be formed from any reachable cord: the whole length of cord
     * round the loop, as if cut and laid straight (pulled at 35 N for CA s 7). A continuous chain's perimeter is its
     * full length, tensioned or not; it bounds the pull-out from above (a loop cannot be pulled out further than
     * half its perimeter) but is not the pull-out. CA s 7 (44 cm) reads this figure.
     */
    loopPerimeterMm: lengthMm(2 * MAX_LENGTH_MM),
    /** Longest reachable free-end cord. */
    freeCordLengthMm: lengthMm(),
    /** Operating cord length; where a free cord is also recorded, the longer of the two decides. */
    operatingCordLengthMm: lengthMm(),
    rearCordSpacingMm: lengthMm(),
    innerCordStops: flag(),
    tensionDevice: flag(),
    tensionDeviceHeightMm: lengthMm(),
    /** Force the fixed tension device held for 10 s in a pull test. */
    tensionDeviceHoldN: forceN(),
    /** A child cannot take the cord out of the tension device. */
    tensionDeviceTamperProof: flag(),
    /** Added: what the tension device or cleat is fixed into (advice on fixings). */
    deviceFixing: enumOf(deviceFixings).nullable().default(null),
    cleat: flag(),
    cleatHeightMm: lengthMm(),
    /** A breakaway connector is fitted. */
    breakaway: flag(),
    warningLabel: flag(),
    /** The supplied swing tag is still attached. */
    swingTag: flag(),
    installerLabel: flag(),
    manufacturerLabel: flag(),
    climbableFurnitureNearby: flag(),
    /** Added: the room is a child's bedroom or playroom (cordless-in-children's-rooms advice). */
    childrensRoom: flag(),
    /** Added: longest reachable cord length between two consecutive contact points, pulled at 35 N (CA s 6). */
    cordSpanMm: lengthMm(),
    /** Added: length two reachable free-end cords reach when joined, pulled out flat; 0 if only one free end (CA s 8). */
    jointFreeCordsMm: lengthMm(),
    /** Added: false when the inner cords cannot be reached at all (US inner-cord clause). */
    innerCordsReachable: flag(),
    /** Added: the buyer asked for an operating cord longer than the US custom default. */
    longerCordRequested: flag(),
    /**
     * Added: pull-out of the inner (lift) or rear cords: with the covering fully lowered and the inner cord stops
     * as fitted, pull an inner or rear cord out between the slats, folds or rings as far as it comes, lay the loop
     * flat and record its length (0 when nothing comes out). Judged like any loop (AU s 6(1)(a); CA s 7 as twice it).
     */
    innerLoopPullOutMm: lengthMm(),
    /** Added: an inner or rear cord can be pulled into a loop a child's head could pass through (a hazardous loop), stops as fitted. */
    innerCordLoop: flag(),
    /** Added: the operating cord or loop cannot be reached (rigid shroud or built-in restraint; US A100.1-2018 §4.3.1.3). */
    operatingCordsInaccessible: flag(),
    /** Added: with the tension device fixed, the loop or cord is held taut: no loop can be drawn out past the device beyond the ~10 mm ease. */
    tensionDeviceHoldsTaut: flag(),
    /** Added: the tension device came attached to the cord or chain from the maker (US A100.1-2022). */
    tensionDeviceFactoryFitted: flag(),
    /** Added: the covering can still be raised or lowered with the tension device not installed under tension (true is a fault, US A100.1-2022). */
    operatesWithoutTensionDevice: flag(),
    /** Added: a free-hanging tilt cord is fitted (slats are tilted by a hanging cord, not a wand). */
    freeTiltCord: flag(),
    /** Added: two or more operating cords end in one connector or tassel. */
    multiCordConnector: flag(),
    /** Added: installed as the instructions on the product's retail packaging say (AU 2014 standard). */
    installedPerInstructions: flag(),
    /** Added: installed in trade or commerce (by a business, as a paid service); false for the occupier's own fitting. */
    installedByBusiness: flag(),
    /** Added: the product carries the warning that it is for premises where young children are not present (EU offices, industry). */
    childFreePremisesWarning: flag(),
    /** Added: the product's information and instructions are in English and French (CA). */
    bilingualInformation: flag(),
  })
  .superRefine((r, ctx) => {
    // Cords hang from the headrail, so nothing on them can sit higher than its top.
    if (isLength(r.headHeightMm) && isLength(r.lowestCordPointMm) && r.lowestCordPointMm > r.headHeightMm) {
      ctx.addIssue({ code: 'custom', path: ['lowestCordPointMm'], message: `must not be higher than headHeightMm (${r.headHeightMm} mm)` })
    }
    if (isLength(r.headHeightMm) && isLength(r.tensionDeviceHeightMm) && r.tensionDeviceHeightMm > r.headHeightMm) {
      ctx.addIssue({ code: 'custom', path: ['tensionDeviceHeightMm'], message: `must not be higher than headHeightMm (${r.headHeightMm} mm)` })
    }
    // A covering cannot be installed before it was made; a month-only date is compared by month.
    // Compared only when both dates are real, so a bad date is reported once, under its own field.
    if (r.installedOn !== null && r.manufacturedOn !== null && isRealDate(r.installedOn, true) && isRealDate(r.manufacturedOn, false)) {
      const made = r.manufacturedOn
      const installed = made.length === 7 ? r.installedOn.slice(0, 7) : r.installedOn
      if (installed < made) {
        ctx.addIssue({ code: 'custom', path: ['installedOn'], message: `must not be before manufacturedOn (${made})` })
      }
    }
  })

/** A validated covering record: every field present, null where not recorded. */
export type CoveringRecord = z.output<typeof coveringRecordSchema>
/** What a caller may send: optional fields may be left out. */
export type CoveringRecordInput = z.input<typeof coveringRecordSchema>
export type RecordField = keyof CoveringRecord

// validateRecords(), formatRecordError() and the fast parser live in validate.ts.
