import { z } from 'zod'
import { multilineText } from './common'
import { coveringCreateSchema } from './register'

// The body of a sign-off. `measurements` is the rulebook record's measured fields; the server adds
// the register's own data (ref, jurisdiction, premises, product, control, dates) before checking.
export const inspectionKinds = ['fitting', 'audit', 'correction'] as const
/** The covering's own fields that the rulebook reads; a sign-off may change them with the visit, in one transaction. */
export const ruleReadCoveringFields = ['productType', 'control', 'madeTo', 'manufacturedOn', 'installedOn'] as const
export const signOffCoveringSchema = coveringCreateSchema.pick({ productType: true, control: true, madeTo: true, manufacturedOn: true, installedOn: true })
  .partial().strict()
export const inspectionCreateSchema = z.object({
  kind: z.enum(inspectionKinds, { error: `kind must be one of ${inspectionKinds.join(', ')}` }).default('fitting'),
  measurements: z.record(z.string(), z.unknown(), { error: 'measurements must be an object of measured values' }),
  photoIds: z.array(z.number().int().positive(), { error: 'photoIds must be a list of photo ids' }).max(50, 'photoIds: at most 50 photos').default([]),
  notes: multilineText(2000, 'notes'),
  clientKey: z.string().regex(/^[\w-]{8,64}$/, 'clientKey is 8 to 64 letters, digits, - or _').nullish().transform(v => v ?? null),
  inspectedAt: z.iso.datetime({ offset: true, error: 'inspectedAt is an ISO date-time' }).nullish().transform(v => v ?? null),
  correctsId: z.number().int().positive().nullish().transform(v => v ?? null),
  auditId: z.number().int().positive().nullish().transform(v => v ?? null),
  covering: signOffCoveringSchema.nullish().transform(v => v ?? null),
})
  .refine(v => v.kind !== 'audit' || v.auditId !== null, { message: 'auditId: an audit inspection names the open audit of this site it belongs to', path: ['auditId'] })
  .refine(v => v.kind !== 'correction' || v.correctsId !== null, { message: 'correctsId: a correction names the inspection of this covering it corrects', path: ['correctsId'] })
export type InspectionCreate = z.infer<typeof inspectionCreateSchema>
