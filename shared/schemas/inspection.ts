import { z } from 'zod'

// The body of a sign-off. `measurements` is the rulebook record's measured fields; the server adds
// the register's own data (ref, jurisdiction, premises, product, control, dates) before checking.
export const inspectionKinds = ['fitting', 'audit', 'correction'] as const
export const inspectionCreateSchema = z.object({
  kind: z.enum(inspectionKinds, { error: `kind must be one of ${inspectionKinds.join(', ')}` }).default('fitting'),
  measurements: z.record(z.string(), z.unknown(), { error: 'measurements must be an object of measured values' }),
  photoIds: z.array(z.number().int().positive(), { error: 'photoIds must be a list of photo ids' }).max(50, 'photoIds: at most 50 photos').default([]),
  notes: z.string().trim().max(2000, 'notes is at most 2000 characters').nullish().transform(v => v || null),
  clientKey: z.string().regex(/^[\w-]{8,64}$/, 'clientKey is 8 to 64 letters, digits, - or _').nullish().transform(v => v ?? null),
  inspectedAt: z.iso.datetime({ offset: true, error: 'inspectedAt is an ISO date-time' }).nullish().transform(v => v ?? null),
  correctsId: z.number().int().positive().nullish().transform(v => v ?? null),
  auditId: z.number().int().positive().nullish().transform(v => v ?? null),
})
export type InspectionCreate = z.infer<typeof inspectionCreateSchema>
