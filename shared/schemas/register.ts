import { z } from 'zod'
import { controlTypes, jurisdictions, madeToValues, premisesTypes, productTypes } from '../../rules'
import { idValue, listQuerySchema, multilineText, optionalText, refText, requiredText, someFieldOf } from './common'
import { emailSchema } from './auth'

// Create and update bodies for the register: clients, sites, units, openings, coverings.
const enumOf = <T extends readonly [string, ...string[]]>(values: T, field: string) =>
  z.enum(values, { error: `${field} must be one of ${values.join(', ')}` })
const idOf = (field: string) => idValue(field)
const mmOf = (field: string, max = 10_000) =>
  z.number({ error: `${field} must be a number of millimetres` }).int(`${field} is whole millimetres`).positive(`${field} must be above 0 mm`).max(max, `${field} above ${max} mm is not a real window`).nullish().transform(v => v ?? null)

export const clientCreateSchema = z.object({
  name: requiredText(160, 'name'),
  contactName: optionalText(120, 'contactName'),
  reportEmail: emailSchema,
  phone: optionalText(40, 'phone'),
  reinspectIntervalMonths: z.number({ error: 'reinspectIntervalMonths must be a number' }).int().min(1).max(120).optional(),
})
export const clientPatchSchema = someFieldOf(clientCreateSchema.partial())
export const clientListQuery = listQuerySchema(['name', 'createdAt'], 'name')

export const siteCreateSchema = z.object({
  clientId: idOf('clientId'),
  ref: refText('ref'),
  name: requiredText(160, 'name'),
  address: requiredText(300, 'address'),
  jurisdiction: enumOf(jurisdictions, 'jurisdiction'),
  premises: enumOf(premisesTypes, 'premises'),
  notes: multilineText(2000, 'notes'),
})
export const sitePatchSchema = someFieldOf(siteCreateSchema.omit({ clientId: true }).partial())
export const siteListQuery = listQuerySchema(['name', 'ref', 'jurisdiction', 'updatedAt', 'failing'], 'name').extend({
  clientId: idOf('clientId').optional(),
  jurisdiction: enumOf(jurisdictions, 'jurisdiction').optional(),
  assigned: z.enum(['me']).optional(),
})

export const unitCreateSchema = z.object({
  siteId: idOf('siteId'),
  ref: refText('ref'),
  name: optionalText(120, 'name'),
  floor: optionalText(40, 'floor'),
  notes: multilineText(2000, 'notes'),
})
export const unitPatchSchema = someFieldOf(unitCreateSchema.omit({ siteId: true }).partial())
export const unitListQuery = listQuerySchema(['ref', 'name', 'createdAt'], 'ref').extend({ siteId: idOf('siteId').optional() })

export const openingKinds = ['window', 'door', 'other'] as const
const openingFields = z.object({
  unitId: idOf('unitId'),
  ref: refText('ref'),
  room: requiredText(80, 'room'),
  kind: enumOf(openingKinds, 'kind'),
  childrensRoom: z.boolean({ error: 'childrensRoom must be true or false' }),
  recessWidthMm: mmOf('recessWidthMm'),
  recessHeightMm: mmOf('recessHeightMm'),
  notes: multilineText(2000, 'notes'),
})
export const openingCreateSchema = openingFields.extend({
  kind: openingFields.shape.kind.default('window'),
  childrensRoom: openingFields.shape.childrensRoom.default(false),
})
// No defaults here: a PATCH that leaves a field out must leave it as it is.
export const openingPatchSchema = someFieldOf(openingFields.omit({ unitId: true }).partial())
export const openingListQuery = listQuerySchema(['ref', 'room', 'createdAt'], 'ref').extend({
  siteId: idOf('siteId').optional(), unitId: idOf('unitId').optional(),
})

export const mounts = ['inside', 'outside'] as const
export const fixings = ['top', 'face'] as const
export const controlSides = ['left', 'right', 'centre'] as const
export const verdicts = ['compliant', 'non_compliant', 'incomplete', 'not_applicable', 'unchecked'] as const
export const coveringCreateSchema = z.object({
  openingId: idOf('openingId'),
  ref: refText('ref'),
  productType: enumOf(productTypes, 'productType'),
  control: enumOf(controlTypes, 'control'),
  madeTo: enumOf(madeToValues, 'madeTo').nullish().transform(v => v ?? null),
  mount: enumOf(mounts, 'mount').nullish().transform(v => v ?? null),
  fixing: enumOf(fixings, 'fixing').nullish().transform(v => v ?? null),
  controlSide: enumOf(controlSides, 'controlSide').nullish().transform(v => v ?? null),
  widthMm: mmOf('widthMm'),
  dropMm: mmOf('dropMm'),
  makerModel: optionalText(160, 'makerModel'),
  manufacturedOn: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])(-(0[1-9]|[12]\d|3[01]))?$/, 'manufacturedOn is YYYY-MM or YYYY-MM-DD').nullish().transform(v => v ?? null),
  installedOn: z.iso.date({ error: 'installedOn is a date, YYYY-MM-DD' }).nullish().transform(v => v ?? null),
})
export const coveringPatchSchema = someFieldOf(coveringCreateSchema.omit({ openingId: true }).partial().extend({
  // Removal is a recorded act with a reason (POST /api/coverings/:id/removal); a PATCH never changes status.
  status: z.never({ error: 'status: remove or replace a covering through its removal (an officer records who, when and why)' }).optional(),
}))
export const coveringListQuery = listQuerySchema(['ref', 'productType', 'control', 'lastVerdict', 'lastInspectedAt'], 'ref').extend({
  siteId: idOf('siteId').optional(),
  unitId: idOf('unitId').optional(),
  openingId: idOf('openingId').optional(),
  verdict: enumOf(verdicts, 'verdict').optional(),
  control: enumOf(controlTypes, 'control').optional(),
})

export type ClientCreate = z.infer<typeof clientCreateSchema>
export type SiteCreate = z.infer<typeof siteCreateSchema>
export type UnitCreate = z.infer<typeof unitCreateSchema>
export type OpeningCreate = z.infer<typeof openingCreateSchema>
export type CoveringCreate = z.infer<typeof coveringCreateSchema>
