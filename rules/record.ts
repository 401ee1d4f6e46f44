import { z } from 'zod'

// The enum lists are exported as const arrays so the app can build its pickers from the same values.
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
    ref: z.string({ error: issue => (issue.input === undefined ? 'is required' : 'must be the covering reference (text)') }).trim().min(1, 'must not be empty').max(200, 'must be at most 200 characters'),
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
    /** Length of the largest loop that can be pulled out, laid flat, with devices as fitted. */
    loopPullOutMm: lengthMm(),
    loopPerimeterMm: lengthMm(2 * MAX_LENGTH_MM),
    /** Longest reachable free-end cord. */
    freeCordLengthMm: lengthMm(),
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

export interface RecordError {
  /** Position of the record in the input array. */
  index: number
  /** The record's ref when it could be read. */
  ref: string | null
  /** Field path, e.g. `loopPullOutMm`; empty when the record itself is wrong. */
  field: string
  message: string
}

export type ValidationResult
  = | { ok: true, records: CoveringRecord[] }
    | { ok: false, errors: RecordError[] }

/** Validate an array of raw records; every error names the record index, its ref and the field. */
export function validateRecords(input: unknown): ValidationResult {
  if (!Array.isArray(input)) {
    return { ok: false, errors: [{ index: -1, ref: null, field: '', message: 'input must be an array of records' }] }
  }
  const records: CoveringRecord[] = []
  const errors: RecordError[] = []
  for (let index = 0; index < input.length; index++) {
    const raw: unknown = input[index]
    const parsed = coveringRecordSchema.safeParse(raw)
    if (parsed.success) {
      records.push(parsed.data)
      continue
    }
    const ref = raw !== null && typeof raw === 'object' && typeof (raw as { ref?: unknown }).ref === 'string' ? (raw as { ref: string }).ref : null
    for (const issue of parsed.error.issues) {
      errors.push({ index, ref, field: issue.path.map(String).join('.'), message: issue.message })
    }
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, records }
}

/** One line per error, for people: `record 3 (ref "K-12"): loopPullOutMm: must be at least 0 mm`. */
export function formatRecordError(e: RecordError): string {
  const where = e.index < 0 ? 'input' : `record ${e.index}${e.ref !== null ? ` (ref ${JSON.stringify(e.ref)})` : ''}`
  return `${where}: ${e.field === '' ? '' : `${e.field}: `}${e.message}`
}
