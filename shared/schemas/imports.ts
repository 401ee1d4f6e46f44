import { z } from 'zod'
import { controlTypes, coveringRecordSchema, deviceFixings, jurisdictions, madeToValues, premisesTypes, productTypes, readForce, readLength } from '../../rules'
import type { RecordField } from '../../rules'
import { idValue, listQuerySchema, plainString } from './common'

// The import template: its columns, how each cell is read, and the row schema. The page, the
// README table, the template download and the import job all read this one list.

export type CellKind = 'ref' | 'text' | 'enum' | 'length' | 'force' | 'flag' | 'date' | 'month'
export type ColumnLevel = 'site' | 'unit' | 'opening' | 'covering' | 'measurement'

export interface ImportColumn {
  name: string
  kind: CellKind
  level: ColumnLevel
  about: string
  /** The rulebook record field the column fills, when it is one. */
  field?: RecordField
  values?: readonly string[]
  maxLength?: number
}

export const MAX_IMPORT_ROWS = 50_000
export const MAX_IMPORT_BYTES = 32 * 1024 * 1024

const registerColumns: ImportColumn[] = [
  { name: 'site_ref', kind: 'ref', level: 'site', about: 'the site\'s reference in your workspace; rows are matched to sites by it (required)' },
  { name: 'site_name', kind: 'text', level: 'site', maxLength: 160, about: 'site name (needed for a new site)' },
  { name: 'address', kind: 'text', level: 'site', maxLength: 300, about: 'site address (needed for a new site)' },
  { name: 'jurisdiction', kind: 'enum', level: 'site', values: jurisdictions, about: 'whose rules apply: AU, CA, US or EU (needed for a new site)' },
  { name: 'premises', kind: 'enum', level: 'site', values: premisesTypes, about: 'kind of premises (needed for a new site)' },
  { name: 'unit_ref', kind: 'ref', level: 'unit', about: 'the unit\'s reference within its site (required)' },
  { name: 'unit_name', kind: 'text', level: 'unit', maxLength: 120, about: 'unit name, e.g. Flat 2' },
  { name: 'opening_ref', kind: 'ref', level: 'opening', about: 'the window or door\'s reference within its unit (needed with a covering)' },
  { name: 'room', kind: 'text', level: 'opening', maxLength: 80, about: 'room the opening is in (needed for a new opening)' },
  { name: 'childrens_room', kind: 'flag', level: 'opening', field: 'childrensRoom', about: 'the room is a child\'s bedroom or playroom' },
  { name: 'covering_ref', kind: 'ref', level: 'covering', about: 'the covering\'s reference, unique within its site; leave empty for a unit without coverings' },
  { name: 'product_type', kind: 'enum', level: 'covering', field: 'productType', values: productTypes, about: 'product (needed for a new covering)' },
  { name: 'control', kind: 'enum', level: 'covering', field: 'control', values: controlTypes, about: 'how it is worked (needed for a new covering)' },
  { name: 'made_to', kind: 'enum', level: 'covering', field: 'madeTo', values: madeToValues, about: 'stock or custom' },
  { name: 'installed_on', kind: 'date', level: 'covering', field: 'installedOn', about: 'date installed, YYYY-MM-DD' },
  { name: 'manufactured_on', kind: 'month', level: 'covering', field: 'manufacturedOn', about: 'date made, YYYY-MM or YYYY-MM-DD' },
  { name: 'measured_on', kind: 'date', level: 'measurement', about: 'date the measurements below were taken, YYYY-MM-DD (needed with measurements)' },
]

// Words for each measured field of the rulebook record; a field added to the record without words here fails a unit test.
export const measurementAbout: Partial<Record<RecordField, string>> = {
  headHeightMm: 'top of the headrail above the floor',
  productHeightMm: 'height of the product',
  lowestCordPointMm: 'lowest point any cord or chain reaches above the floor, devices as fitted',
  loopPullOutMm: 'longest loop that can be pulled out, laid flat',
  loopPerimeterMm: 'perimeter of the largest loop',
  freeCordLengthMm: 'longest reachable free cord',
  operatingCordLengthMm: 'operating cord length',
  rearCordSpacingMm: 'spacing of the rear cords',
  innerCordStops: 'inner cord stops fitted',
  tensionDevice: 'tension device fitted',
  tensionDeviceHeightMm: 'tension device height above the floor',
  tensionDeviceHoldN: 'force the fixed tension device held for 10 s',
  tensionDeviceTamperProof: 'a child cannot take the cord out of the tension device',
  deviceFixing: 'what the tension device or cleat is fixed into',
  cleat: 'cleat fitted',
  cleatHeightMm: 'cleat height above the floor',
  breakaway: 'breakaway connector fitted',
  warningLabel: 'warning label attached',
  swingTag: 'supplied swing tag still attached',
  installerLabel: 'installer\'s label attached',
  manufacturerLabel: 'maker\'s label attached',
  climbableFurnitureNearby: 'climbable furniture near the covering',
  cordSpanMm: 'longest reachable cord span between two contact points, pulled at 35 N',
  jointFreeCordsMm: 'length two free cords reach when joined (0 with one free end)',
  innerCordsReachable: 'inner cords can be reached',
  longerCordRequested: 'buyer asked for a longer operating cord',
  innerLoopPullOutMm: 'longest loop an inner or rear cord can be pulled out to, laid flat',
  innerCordLoop: 'an inner or rear cord can be pulled into a loop a child\'s head could pass through',
  operatingCordsInaccessible: 'the operating cord or loop cannot be reached (shroud or built-in restraint)',
  tensionDeviceHoldsTaut: 'the fixed tension device holds the loop taut',
  tensionDeviceFactoryFitted: 'the tension device came attached from the maker',
  operatesWithoutTensionDevice: 'the covering still works with the tension device not under tension',
  freeTiltCord: 'a free-hanging tilt cord is fitted',
  multiCordConnector: 'several operating cords end in one connector or tassel',
  installedPerInstructions: 'installed as the packaged instructions say',
  installedByBusiness: 'installed by a business (in trade or commerce)',
  childFreePremisesWarning: 'marked for premises without young children',
  bilingualInformation: 'information and instructions in English and French',
}

/** camelCase record field → snake_case column: `tensionDeviceHoldN` → `tension_device_hold_n`. */
export function columnNameOf(field: string) {
  return field.replace(/([A-Z])/g, '_$1').toLowerCase()
}

const enumFields: Partial<Record<RecordField, readonly string[]>> = { deviceFixing: deviceFixings }
const taken = new Set(registerColumns.map(c => c.field).filter(Boolean) as string[])
const recordOwn = new Set(['ref', 'jurisdiction', 'premises'])

function measurementColumn(field: RecordField): ImportColumn {
  const about = measurementAbout[field] ?? field
  const values = enumFields[field]
  if (values) return { name: columnNameOf(field), kind: 'enum', level: 'measurement', field, values, about }
  if (field.endsWith('Mm')) return { name: columnNameOf(field), kind: 'length', level: 'measurement', field, about: `${about} (mm)` }
  if (field.endsWith('N')) return { name: columnNameOf(field), kind: 'force', level: 'measurement', field, about: `${about} (N)` }
  return { name: columnNameOf(field), kind: 'flag', level: 'measurement', field, about: `${about} (yes/no)` }
}

/** Every column of the template, in template order; the measured fields follow the rulebook record. */
export const importColumns: readonly ImportColumn[] = [
  ...registerColumns,
  ...(Object.keys(coveringRecordSchema.shape) as RecordField[]).filter(f => !recordOwn.has(f) && !taken.has(f)).map(measurementColumn),
]
export const importColumnByName = new Map(importColumns.map(c => [c.name, c]))
export const measurementColumns = importColumns.filter(c => c.level === 'measurement' && c.field)
export type ImportColumnName = string

// ----- cells -----

type Cell<T> = { value: T } | { error: string }
const refPattern = /^[\w.\-/ #]+$/u
// eslint-disable-next-line no-control-regex
const controlCharacter = /[\u0000-\u001F\u007F]/
const quote = (raw: string) => `“${raw.length > 40 ? `${raw.slice(0, 40)}…` : raw}”`
const DAYS = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]

function isRealDate(text: string, dayRequired: boolean) {
  const m = /^(\d{4})-(\d{2})(?:-(\d{2}))?$/.exec(text)
  if (!m) return false
  const year = Number(m[1]), month = Number(m[2])
  if (year < 1900 || year > 2100 || month < 1 || month > 12) return false
  if (m[3] === undefined) return !dayRequired
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0
  const day = Number(m[3])
  return day >= 1 && day <= (month === 2 && !leap ? 28 : DAYS[month - 1]!)
}

/**
 * A number with an optional unit, read by the rulebook's one parser (rules/lengths.ts) as the fitting form reads it:
 * lengths in mm (the default), cm, m or in (inches to a tenth of a mm); forces in N, as written.
 */
function readNumber(column: ImportColumn, raw: string): Cell<number> {
  const read = (column.kind === 'force' ? readForce(raw, 'column') : readLength(raw, 'mm', 'column')) ?? { error: 'is empty' }
  return read.error !== undefined ? { error: read.error } : { value: read.value }
}

function readFlag(raw: string): Cell<boolean> {
  const v = raw.toLowerCase()
  if (v === 'yes' || v === 'true' || v === '1') return { value: true }
  if (v === 'no' || v === 'false' || v === '0') return { value: false }
  return { error: `${quote(raw)} is not yes or no; write yes, no, true, false, 1 or 0, or leave it empty when not recorded` }
}

function readEnum(column: ImportColumn, raw: string): Cell<string> {
  const values = column.values!
  const v = column.name === 'jurisdiction' ? raw.toUpperCase() : raw.toLowerCase().replace(/[\s-]+/g, '_')
  if (values.includes(v)) return { value: v }
  const what = column.name === 'jurisdiction' ? 'unknown jurisdiction' : `unknown ${column.name.replace(/_/g, ' ')}`
  return { error: `${what} ${quote(raw)}; use one of ${values.join(', ')}` }
}

/** Reads one cell: empty (or spaces only) means not recorded (null). */
export function readCell(column: ImportColumn, input: string | undefined): Cell<string | number | boolean | null> {
  const raw = (input ?? '').trim()
  if (raw === '') return { value: null }
  switch (column.kind) {
    case 'ref':
      if (raw.length > 60) return { error: 'is longer than 60 characters' }
      return refPattern.test(raw) ? { value: raw } : { error: `${quote(raw)} may hold letters, digits, spaces and . - / # only` }
    case 'text':
      if (controlCharacter.test(raw)) return { error: 'holds a line break or another control character; keep the cell to plain text on one line' }
      return raw.length > column.maxLength! ? { error: `is longer than ${column.maxLength} characters` } : { value: raw }
    case 'enum': return readEnum(column, raw)
    case 'length':
    case 'force': return readNumber(column, raw)
    case 'flag': return readFlag(raw)
    case 'date': return isRealDate(raw, true) ? { value: raw } : { error: `${quote(raw)} is not a date written YYYY-MM-DD` }
    case 'month': return isRealDate(raw, false) ? { value: raw } : { error: `${quote(raw)} is not a date written YYYY-MM or YYYY-MM-DD` }
  }
}

// ----- the header -----

/** `Head Height (mm)`, `HEAD-HEIGHT-MM` and `head_height_mm` all name the same column. */
export function normaliseHeader(cell: string) {
  return cell.replace(/^\uFEFF/, '').trim().toLowerCase().replace(/\((mm|n)\)$/, '_$1').replace(/[\s\-.]+/g, '_').replace(/_+/g, '_').replace(/^_|_$/g, '')
}

export type HeaderMap = Array<ImportColumn | null>

/** Maps the header row to columns, or says what is wrong with it in words a person can act on. */
export function mapHeader(header: string[]): { map: HeaderMap } | { error: string } {
  const seen = new Set<string>()
  const unknown: string[] = []
  const twice: string[] = []
  const map = header.map((cell) => {
    const name = normaliseHeader(cell)
    if (name === '') return null
    const column = importColumnByName.get(name)
    if (!column) unknown.push(cell.trim())
    else if (seen.has(name)) twice.push(name)
    seen.add(name)
    return column ?? null
  })
  const list = (names: string[]) => `${names.slice(0, 5).join(', ')}${names.length > 5 ? '…' : ''}`
  if (unknown.length) return { error: `the header has ${unknown.length === 1 ? 'a column' : 'columns'} the template does not know: ${list(unknown)}; check the spelling against the template` }
  if (twice.length) return { error: `the header names ${list(twice)} twice; keep one column of each name` }
  for (const required of ['site_ref', 'unit_ref']) {
    if (!seen.has(required)) return { error: `the header has no ${required} column; the first row must name the columns, as in the template` }
  }
  return { map }
}

// ----- a row -----

export type ImportRow = Record<string, string | number | boolean | null>
export interface RowProblem { column: string, message: string }

const has = (row: ImportRow, names: readonly string[]) => names.filter(n => row[n] !== null && row[n] !== undefined)
const openingOnly = ['room', 'childrens_room']
const coveringOnly = importColumns.filter(c => c.level === 'covering' && c.name !== 'covering_ref').map(c => c.name)
const measured = ['measured_on', ...measurementColumns.map(c => c.name)]
const measuredValues = measurementColumns.map(c => c.name)

/**
 * The rules that tie a row's columns together, over cells already read by readCell. One schema object per row
 * rather than one per cell: an import checks up to 50,000 rows, and the rulebook's schema checks the record too.
 */
export const importRowSchema = z.custom<ImportRow>(v => typeof v === 'object' && v !== null).superRefine((row, ctx) => {
  const need = (column: string, message: string) => ctx.addIssue({ code: 'custom', path: [column], message })
  if (row.site_ref === null) need('site_ref', 'is empty; every row names its site')
  if (row.unit_ref === null) need('unit_ref', 'is empty; every row names its unit')
  if (row.opening_ref === null && has(row, openingOnly).length) need('opening_ref', `is empty, but ${has(row, openingOnly).join(' and ')} ${has(row, openingOnly).length > 1 ? 'are' : 'is'} given`)
  if (row.covering_ref !== null && row.opening_ref === null) need('opening_ref', 'is empty; a covering needs the window or door it hangs at')
  if (row.covering_ref === null && has(row, [...coveringOnly, ...measured]).length) need('covering_ref', `is empty, but ${has(row, [...coveringOnly, ...measured])[0]} is given`)
  if (row.measured_on === null && row.covering_ref !== null && has(row, measuredValues).length) need('measured_on', 'is empty; give the date these measurements were taken')
  if (typeof row.measured_on === 'string' && row.measured_on > new Date().toISOString().slice(0, 10)) need('measured_on', `${row.measured_on} is in the future`)
})

/** Does the row carry measurements (and so become an inspection)? */
export function hasMeasurements(row: ImportRow) {
  return has(row, measuredValues).length > 0
}

// Every column present and null (not recorded) until a cell says otherwise; copied, so each row has the same shape.
const emptyRow: ImportRow = Object.fromEntries(importColumns.map(c => [c.name, null]))

/** Reads a raw CSV record through the header map into a row, or lists its problems by column. */
export function readRow(map: HeaderMap, record: string[]): { row: ImportRow } | { problems: RowProblem[] } {
  const row: ImportRow = { ...emptyRow }
  const problems: RowProblem[] = []
  for (let i = 0; i < map.length; i++) {
    const column = map[i]
    if (!column) continue
    const cell = readCell(column, record[i])
    if ('error' in cell) problems.push({ column: column.name, message: cell.error })
    else row[column.name] = cell.value
  }
  if (record.length > map.length && record.slice(map.length).some(c => c.trim() !== '')) {
    problems.push({ column: '', message: `the row has ${record.length} cells but the header names ${map.length} columns` })
  }
  // The rules between columns only make sense once every cell could be read.
  if (problems.length) return { problems }
  const checked = importRowSchema.safeParse(row)
  if (!checked.success) return { problems: checked.error.issues.map(issue => ({ column: String(issue.path[0] ?? ''), message: issue.message })) }
  return { row }
}

// ----- the template file -----

const sampleRows: Array<Record<string, string>> = [
  { site_ref: 'SAMPLE-1', site_name: 'Sample Court (delete these two rows)', address: '1 Sample Street, Sampleton', jurisdiction: 'AU', premises: 'rental_home',
    unit_ref: 'U1', unit_name: 'Unit 1', opening_ref: 'W1', room: 'Bedroom 2', childrens_room: 'yes', covering_ref: 'SAMPLE-1-01', product_type: 'roller', control: 'chain_loop',
    made_to: 'custom', installed_on: '2025-03-14', manufactured_on: '2025-02', measured_on: '2026-01-20', head_height_mm: '2150mm', lowest_cord_point_mm: '880',
    loop_pull_out_mm: '35mm', tension_device: 'yes', tension_device_height_mm: '880', tension_device_hold_n: '85N', tension_device_tamper_proof: 'yes',
    device_fixing: 'masonry_plugs', warning_label: 'yes', swing_tag: 'yes', installer_label: 'yes', manufacturer_label: 'yes', installed_per_instructions: 'yes' },
  { site_ref: 'SAMPLE-1', unit_ref: 'U2', unit_name: 'Unit 2' },
]

/** The template: every column in order, then two sample rows (a measured covering, and a unit alone). */
export function templateRows(): string[][] {
  const names = importColumns.map(c => c.name)
  return [names, ...sampleRows.map(r => names.map(n => r[n] ?? ''))]
}

// ----- requests -----

export const importModes = ['dry-run', 'commit'] as const
const yesNo = z.enum(['true', 'false', '1', '0', 'yes', 'no', 'on'], { error: 'skipInvalid must be true or false' }).transform(v => ['true', '1', 'yes', 'on'].includes(v))

/** The form fields that come with the uploaded file. */
export const importFormSchema = z.object({
  mode: z.enum(importModes, { error: 'mode must be dry-run or commit' }).default('dry-run'),
  skipInvalid: yesNo.default(false),
  clientId: idValue('clientId').optional(),
})
export const importCommitSchema = z.object({
  skipInvalid: z.boolean({ error: 'skipInvalid must be true or false' }).default(false),
})
export const importListQuery = listQuerySchema(['createdAt', 'fileName', 'status'], '-createdAt').extend({
  mode: z.enum(['dry_run', 'commit'], { error: 'mode must be dry_run or commit' }).optional(),
})
export const importErrorsQuery = listQuerySchema(['row'], 'row').extend({
  column: plainString('column').trim().max(60, 'column is at most 60 characters').optional(),
})
export type ImportForm = z.infer<typeof importFormSchema>
