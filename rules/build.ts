import type { CoveringRecordInput } from './record'

/**
 * What the register knows about a covering, its site and its room: the facts a visit does not measure.
 * `childrensRoom` is the room's flag as the register holds it (null when the register does not know it).
 */
export interface RegisterFacts {
  ref: string
  jurisdiction: string
  premises: string
  productType: string
  control: string
  madeTo: string | null
  manufacturedOn: string | null
  installedOn: string | null
  childrensRoom: boolean | null
}

/** Record fields that belong to the register: a measurement never overrides them. */
export const registerFields = ['ref', 'jurisdiction', 'premises', 'productType', 'control', 'madeTo', 'manufacturedOn', 'installedOn', 'childrensRoom'] as const

const fromRegister = new Set<string>(registerFields)

/**
 * The rulebook record of one visit: the register's facts plus what was measured. One rule everywhere (fitting form,
 * sign-off, import, benchmarks): the register wins. Its facts, the room's child's-room flag included, replace any
 * same-named value among the measurements; the flag is changed by editing the room, which marks the covering for
 * a new inspection. Pure: the caller parses the result once (`parseCoveringRecord`).
 */
export function buildRecord(register: RegisterFacts, measurements: Readonly<Record<string, unknown>>): CoveringRecordInput {
  const out: Record<string, unknown> = {}
  for (const key of Object.keys(measurements)) {
    // `__proto__` from parsed JSON is an own key; assigning it here would replace the prototype.
    if (!fromRegister.has(key) && key !== '__proto__') out[key] = measurements[key]
  }
  out.ref = register.ref
  out.jurisdiction = register.jurisdiction
  out.premises = register.premises
  out.productType = register.productType
  out.control = register.control
  out.madeTo = register.madeTo
  out.manufacturedOn = register.manufacturedOn
  out.installedOn = register.installedOn
  out.childrensRoom = register.childrensRoom
  return out as CoveringRecordInput
}

/**
 * The register facts an inspection recorded with its measurements, read back from its stored record: a re-check
 * judges the inspection's own record, never today's register row.
 */
export function registerFactsOf(stored: Readonly<Record<string, unknown>>): RegisterFacts {
  const text = (v: unknown) => (typeof v === 'string' ? v : null)
  return {
    ref: text(stored.ref) ?? '', jurisdiction: text(stored.jurisdiction) ?? '', premises: text(stored.premises) ?? '',
    productType: text(stored.productType) ?? '', control: text(stored.control) ?? '', madeTo: text(stored.madeTo),
    manufacturedOn: text(stored.manufacturedOn), installedOn: text(stored.installedOn),
    childrensRoom: typeof stored.childrensRoom === 'boolean' ? stored.childrensRoom : null,
  }
}
