import type { ZodError } from 'zod'
import {
  CONTROL_CHARACTERS,
  controlTypes,
  coveringRecordSchema,
  deviceFixings,
  jurisdictions,
  madeToValues,
  premisesTypes,
  productTypes,
} from './record'
import type { CoveringRecord, CoveringRecordInput, RecordField } from './record'

// A fast path for the covering record: a hand-written check that accepts exactly what coveringRecordSchema
// accepts and builds the same output object (same keys, same order, nulls filled in). Anything it does not
// accept is handed to the zod schema, so every error a caller sees is zod's own, field-named message.
// tests/unit/rules/validate.test.ts compares the two on generated records, valid and invalid.

type Kind
  = | { k: 'ref' }
    | { k: 'enum', values: ReadonlySet<string>, nullable: boolean }
    | { k: 'number', max: number }
    | { k: 'flag' }
    | { k: 'date', dayRequired: boolean }

const MAX_LENGTH_MM = 20_000
const MAX_FORCE_N = 5_000
const length: Kind = { k: 'number', max: MAX_LENGTH_MM }
const flag: Kind = { k: 'flag' }
const required = (values: readonly string[]): Kind => ({ k: 'enum', values: new Set(values), nullable: false })
const optional = (values: readonly string[]): Kind => ({ k: 'enum', values: new Set(values), nullable: true })

/** How each field is read; a field of the schema missing here fails a unit test. */
export const fieldKinds: Readonly<Record<RecordField, Kind>> = {
  ref: { k: 'ref' },
  jurisdiction: required(jurisdictions),
  premises: required(premisesTypes),
  installedOn: { k: 'date', dayRequired: true },
  manufacturedOn: { k: 'date', dayRequired: false },
  madeTo: optional(madeToValues),
  productType: required(productTypes),
  control: required(controlTypes),
  headHeightMm: length,
  productHeightMm: length,
  lowestCordPointMm: length,
  loopPullOutMm: length,
  loopPerimeterMm: { k: 'number', max: 2 * MAX_LENGTH_MM },
  freeCordLengthMm: length,
  operatingCordLengthMm: length,
  rearCordSpacingMm: length,
  innerCordStops: flag,
  tensionDevice: flag,
  tensionDeviceHeightMm: length,
  tensionDeviceHoldN: { k: 'number', max: MAX_FORCE_N },
  tensionDeviceTamperProof: flag,
  deviceFixing: optional(deviceFixings),
  cleat: flag,
  cleatHeightMm: length,
  breakaway: flag,
  warningLabel: flag,
  swingTag: flag,
  installerLabel: flag,
  manufacturerLabel: flag,
  climbableFurnitureNearby: flag,
  childrensRoom: flag,
  cordSpanMm: length,
  jointFreeCordsMm: length,
  innerCordsReachable: flag,
  longerCordRequested: flag,
  innerLoopPullOutMm: length,
  innerCordLoop: flag,
  operatingCordsInaccessible: flag,
  tensionDeviceHoldsTaut: flag,
  tensionDeviceFactoryFitted: flag,
  operatesWithoutTensionDevice: flag,
  freeTiltCord: flag,
  multiCordConnector: flag,
  installedPerInstructions: flag,
  installedByBusiness: flag,
  childFreePremisesWarning: flag,
  bilingualInformation: flag,
}

const CONTROLTYPES_SET: ReadonlySet<(typeof controlTypes)[number]> = new Set(controlTypes)
const DEVICEFIXINGS_SET: ReadonlySet<(typeof deviceFixings)[number]> = new Set(deviceFixings)
const JURISDICTIONS_SET: ReadonlySet<(typeof jurisdictions)[number]> = new Set(jurisdictions)
const MADETOVALUES_SET: ReadonlySet<(typeof madeToValues)[number]> = new Set(madeToValues)
const PREMISESTYPES_SET: ReadonlySet<(typeof premisesTypes)[number]> = new Set(premisesTypes)
const PRODUCTTYPES_SET: ReadonlySet<(typeof productTypes)[number]> = new Set(productTypes)

const DAYS_IN_MONTH = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]

/** YYYY-MM-DD (or YYYY-MM when the day is optional), a real calendar date between 1900 and 2100. */
function isRealDate(text: string, dayRequired: boolean): boolean {
  const n = text.length
  if (n !== 10 && n !== 7) return false
  if (n === 7 && dayRequired) return false
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i)
    if (i === 4 || i === 7) {
      if (c !== 45) return false
    }
    else if (c < 48 || c > 57) {
      return false
    }
  }
  const year = (text.charCodeAt(0) - 48) * 1000 + (text.charCodeAt(1) - 48) * 100 + (text.charCodeAt(2) - 48) * 10 + (text.charCodeAt(3) - 48)
  const month = (text.charCodeAt(5) - 48) * 10 + (text.charCodeAt(6) - 48)
  if (year < 1900 || year > 2100 || month < 1 || month > 12) return false
  if (n === 7) return true
  const day = (text.charCodeAt(8) - 48) * 10 + (text.charCodeAt(9) - 48)
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0
  const last = month === 2 && !leap ? 28 : DAYS_IN_MONTH[month - 1]!
  return day >= 1 && day <= last
}

// Each reader returns the parsed value, or undefined when the value is not one the schema accepts as it is.
function readNumber(v: unknown, max: number): number | null | undefined {
  if (v === undefined || v === null) return null
  return typeof v === 'number' && v >= 0 && v <= max ? v : undefined
}
function readFlag(v: unknown): boolean | null | undefined {
  if (v === undefined || v === null) return null
  return typeof v === 'boolean' ? v : undefined
}
function readEnum<T extends string>(v: unknown, values: ReadonlySet<T>): T | undefined {
  return typeof v === 'string' && values.has(v as T) ? (v as T) : undefined
}
function readOptionalEnum<T extends string>(v: unknown, values: ReadonlySet<T>): T | null | undefined {
  if (v === undefined || v === null) return null
  return typeof v === 'string' && values.has(v as T) ? (v as T) : undefined
}
function readDate(v: unknown, dayRequired: boolean): string | null | undefined {
  if (v === undefined || v === null) return null
  return typeof v === 'string' && isRealDate(v, dayRequired) ? v : undefined
}
function readRef(v: unknown): string | undefined {
  if (typeof v !== 'string') return undefined
  const t = v.trim()
  return t.length >= 1 && t.length <= 200 && !CONTROL_CHARACTERS.test(t) ? t : undefined
}

/** The record when the input is one the schema accepts; null when zod must decide (and word the errors). */
function fastParse(input: unknown): CoveringRecord | null {
  if (input === null || typeof input !== 'object' || Array.isArray(input)) return null
  const raw = input as { [K in RecordField]?: unknown }
  const ref = readRef(raw.ref)
  if (ref === undefined) return null
  const jurisdiction = readEnum(raw.jurisdiction, JURISDICTIONS_SET)
  if (jurisdiction === undefined) return null
  const premises = readEnum(raw.premises, PREMISESTYPES_SET)
  if (premises === undefined) return null
  const installedOn = readDate(raw.installedOn, true)
  if (installedOn === undefined) return null
  const manufacturedOn = readDate(raw.manufacturedOn, false)
  if (manufacturedOn === undefined) return null
  const madeTo = readOptionalEnum(raw.madeTo, MADETOVALUES_SET)
  if (madeTo === undefined) return null
  const productType = readEnum(raw.productType, PRODUCTTYPES_SET)
  if (productType === undefined) return null
  const control = readEnum(raw.control, CONTROLTYPES_SET)
  if (control === undefined) return null
  const headHeightMm = readNumber(raw.headHeightMm, MAX_LENGTH_MM)
  if (headHeightMm === undefined) return null
  const productHeightMm = readNumber(raw.productHeightMm, MAX_LENGTH_MM)
  if (productHeightMm === undefined) return null
  const lowestCordPointMm = readNumber(raw.lowestCordPointMm, MAX_LENGTH_MM)
  if (lowestCordPointMm === undefined) return null
  const loopPullOutMm = readNumber(raw.loopPullOutMm, MAX_LENGTH_MM)
  if (loopPullOutMm === undefined) return null
  const loopPerimeterMm = readNumber(raw.loopPerimeterMm, 2 * MAX_LENGTH_MM)
  if (loopPerimeterMm === undefined) return null
  const freeCordLengthMm = readNumber(raw.freeCordLengthMm, MAX_LENGTH_MM)
  if (freeCordLengthMm === undefined) return null
  const operatingCordLengthMm = readNumber(raw.operatingCordLengthMm, MAX_LENGTH_MM)
  if (operatingCordLengthMm === undefined) return null
  const rearCordSpacingMm = readNumber(raw.rearCordSpacingMm, MAX_LENGTH_MM)
  if (rearCordSpacingMm === undefined) return null
  const innerCordStops = readFlag(raw.innerCordStops)
  if (innerCordStops === undefined) return null
  const tensionDevice = readFlag(raw.tensionDevice)
  if (tensionDevice === undefined) return null
  const tensionDeviceHeightMm = readNumber(raw.tensionDeviceHeightMm, MAX_LENGTH_MM)
  if (tensionDeviceHeightMm === undefined) return null
  const tensionDeviceHoldN = readNumber(raw.tensionDeviceHoldN, MAX_FORCE_N)
  if (tensionDeviceHoldN === undefined) return null
  const tensionDeviceTamperProof = readFlag(raw.tensionDeviceTamperProof)
  if (tensionDeviceTamperProof === undefined) return null
  const deviceFixing = readOptionalEnum(raw.deviceFixing, DEVICEFIXINGS_SET)
  if (deviceFixing === undefined) return null
  const cleat = readFlag(raw.cleat)
  if (cleat === undefined) return null
  const cleatHeightMm = readNumber(raw.cleatHeightMm, MAX_LENGTH_MM)
  if (cleatHeightMm === undefined) return null
  const breakaway = readFlag(raw.breakaway)
  if (breakaway === undefined) return null
  const warningLabel = readFlag(raw.warningLabel)
  if (warningLabel === undefined) return null
  const swingTag = readFlag(raw.swingTag)
  if (swingTag === undefined) return null
  const installerLabel = readFlag(raw.installerLabel)
  if (installerLabel === undefined) return null
  const manufacturerLabel = readFlag(raw.manufacturerLabel)
  if (manufacturerLabel === undefined) return null
  const climbableFurnitureNearby = readFlag(raw.climbableFurnitureNearby)
  if (climbableFurnitureNearby === undefined) return null
  const childrensRoom = readFlag(raw.childrensRoom)
  if (childrensRoom === undefined) return null
  const cordSpanMm = readNumber(raw.cordSpanMm, MAX_LENGTH_MM)
  if (cordSpanMm === undefined) return null
  const jointFreeCordsMm = readNumber(raw.jointFreeCordsMm, MAX_LENGTH_MM)
  if (jointFreeCordsMm === undefined) return null
  const innerCordsReachable = readFlag(raw.innerCordsReachable)
  if (innerCordsReachable === undefined) return null
  const longerCordRequested = readFlag(raw.longerCordRequested)
  if (longerCordRequested === undefined) return null
  const innerLoopPullOutMm = readNumber(raw.innerLoopPullOutMm, MAX_LENGTH_MM)
  if (innerLoopPullOutMm === undefined) return null
  const innerCordLoop = readFlag(raw.innerCordLoop)
  if (innerCordLoop === undefined) return null
  const operatingCordsInaccessible = readFlag(raw.operatingCordsInaccessible)
  if (operatingCordsInaccessible === undefined) return null
  const tensionDeviceHoldsTaut = readFlag(raw.tensionDeviceHoldsTaut)
  if (tensionDeviceHoldsTaut === undefined) return null
  const tensionDeviceFactoryFitted = readFlag(raw.tensionDeviceFactoryFitted)
  if (tensionDeviceFactoryFitted === undefined) return null
  const operatesWithoutTensionDevice = readFlag(raw.operatesWithoutTensionDevice)
  if (operatesWithoutTensionDevice === undefined) return null
  const freeTiltCord = readFlag(raw.freeTiltCord)
  if (freeTiltCord === undefined) return null
  const multiCordConnector = readFlag(raw.multiCordConnector)
  if (multiCordConnector === undefined) return null
  const installedPerInstructions = readFlag(raw.installedPerInstructions)
  if (installedPerInstructions === undefined) return null
  const installedByBusiness = readFlag(raw.installedByBusiness)
  if (installedByBusiness === undefined) return null
  const childFreePremisesWarning = readFlag(raw.childFreePremisesWarning)
  if (childFreePremisesWarning === undefined) return null
  const bilingualInformation = readFlag(raw.bilingualInformation)
  if (bilingualInformation === undefined) return null
  // Built in one literal, in the schema's key order, so every record shares one object shape.
  const r: CoveringRecord = {
    ref,
    jurisdiction,
    premises,
    installedOn,
    manufacturedOn,
    madeTo,
    productType,
    control,
    headHeightMm,
    productHeightMm,
    lowestCordPointMm,
    loopPullOutMm,
    loopPerimeterMm,
    freeCordLengthMm,
    operatingCordLengthMm,
    rearCordSpacingMm,
    innerCordStops,
    tensionDevice,
    tensionDeviceHeightMm,
    tensionDeviceHoldN,
    tensionDeviceTamperProof,
    deviceFixing,
    cleat,
    cleatHeightMm,
    breakaway,
    warningLabel,
    swingTag,
    installerLabel,
    manufacturerLabel,
    climbableFurnitureNearby,
    childrensRoom,
    cordSpanMm,
    jointFreeCordsMm,
    innerCordsReachable,
    longerCordRequested,
    innerLoopPullOutMm,
    innerCordLoop,
    operatingCordsInaccessible,
    tensionDeviceHoldsTaut,
    tensionDeviceFactoryFitted,
    operatesWithoutTensionDevice,
    freeTiltCord,
    multiCordConnector,
    installedPerInstructions,
    installedByBusiness,
    childFreePremisesWarning,
    bilingualInformation,
  }
  // The schema's cross-field checks: any doubt goes to zod, which reports them.
  if (headHeightMm !== null) {
    if (lowestCordPointMm !== null && lowestCordPointMm > headHeightMm) return null
    if (tensionDeviceHeightMm !== null && tensionDeviceHeightMm > headHeightMm) return null
  }
  if (installedOn !== null && manufacturedOn !== null) {
    const installed = manufacturedOn.length === 7 ? installedOn.slice(0, 7) : installedOn
    if (installed < manufacturedOn) return null
  }
  return r
}

export type RecordParseResult
  = | { success: true, data: CoveringRecord, error?: undefined }
    | { success: false, data?: undefined, error: ZodError<CoveringRecordInput> }

/**
 * Parse one raw covering record: the same result as `coveringRecordSchema.safeParse(input)` (same output
 * object, same field-named errors), several times faster on valid records.
 */
export function parseCoveringRecord(input: unknown): RecordParseResult {
  const fast = fastParse(input)
  if (fast !== null) return { success: true, data: fast }
  return coveringRecordSchema.safeParse(input) as RecordParseResult
}

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
    const parsed = parseCoveringRecord(raw)
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
