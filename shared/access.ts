import type { Role } from './schemas/common'

// Who may do what, named once. Handlers guard with `requireRole(event, canFit)`, pages with
// `definePageMeta({ middleware: 'role', roles: canFit })`, and the access-matrix test reads the same sets.

/** Every signed-in member of a workspace: admins, compliance officers, installers and property managers. */
export const canRead = ['admin', 'officer', 'installer', 'manager'] as const satisfies readonly Role[]

/** The fitting crew and the office: record coverings, measurements, photos and inspections; print labels. */
export const canFit = ['admin', 'officer', 'installer'] as const satisfies readonly Role[]

/** The office: audit sites, settle remedies, manage clients and sites, send reports. */
export const canAudit = ['admin', 'officer'] as const satisfies readonly Role[]

/** Those answerable for a portfolio's compliance: import units, re-check, export and download reports. */
export const canOversee = ['admin', 'officer', 'manager'] as const satisfies readonly Role[]

/** Only a property manager: asks the office for an audit of their client's sites. */
export const canRequestAudit = ['manager'] as const satisfies readonly Role[]

/** Workspace administration: people, sign-in and the outgoing mailbox. */
export const canAdminister = ['admin'] as const satisfies readonly Role[]

export type RoleSet = readonly Role[]
