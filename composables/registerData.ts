import type { MaybeRefOrGetter, Ref } from 'vue'
import type { ListResult } from '#shared/schemas/common'
import type { ActivityRow, ClientRow } from '#shared/types/register'
import type { ImportRowError, ImportSummary, PortfolioCoveringRow, PortfolioSummary, PortfolioUnitRow } from '#shared/types/jobs'
import type { AuditDetail, RemedyRow, TeamMember } from './auditRows'
import type { MailItem, MailMessage, UserRow } from './rows'
import type { RuleSetDescription } from '../rules'

// The other fetches, by domain (clients, audits, remedies, people, activity, mail, imports, the portfolio), each with
// its cache key, so pages never type one (see siteData.ts and coveringData.ts for sites and coverings).

type Id = MaybeRefOrGetter<number | string>
type Query = MaybeRefOrGetter<Record<string, string | number | undefined>>

export const ruleKeys = { sets: 'rules' } as const

/** Every rule set with its clauses, for the rulebook page. */
export function useRuleSets() {
  return useFetch<RuleSetDescription[]>('/api/rules', { key: ruleKeys.sets })
}

export const clientKeys = { one: (id: number | string) => `client-${id}`, list: 'clients-list', options: 'clients-options' } as const

/** The clients list page, for `query` from useListQuery. */
export function useClientList(query: Query) {
  return useFetch<ListResult<ClientRow>>('/api/clients', { key: clientKeys.list, query })
}

/** Up to 100 clients by name, to pick one; `enabled` false (a manager, who has one client) fetches nothing. */
export function useClientOptions(enabled = true) {
  return useFetch<ListResult<ClientRow>>('/api/clients', { key: clientKeys.options, query: { pageSize: 100, sort: 'name' }, immediate: enabled })
}

export function useClient(id: Id) {
  return useFetch<ClientRow>(() => `/api/clients/${toValue(id)}`, { key: clientKeys.one(toValue(id)) })
}

export const auditKeys = { one: (id: number | string) => `audit-${id}` } as const

/** One audit with its items; a missing or foreign one is an error with status 404. */
export function useAudit(id: Id) {
  return useFetch<AuditDetail>(() => `/api/audits/${toValue(id)}`, { key: auditKeys.one(toValue(id)) })
}

export const remedyKeys = { list: 'remedies-list', team: 'team' } as const

/** The remedies list page, for `query` from useListQuery. */
export function useRemedyList(query: Query) {
  return useFetch<ListResult<RemedyRow>>('/api/fixes', { key: remedyKeys.list, query })
}

/** The people remedies can be assigned to; only the office may list them, so others pass `enabled` false. */
export function useTeam(enabled = true) {
  return useFetch<{ items: TeamMember[] }>('/api/team', { key: remedyKeys.team, immediate: enabled })
}

export const userKeys = { list: 'users-list' } as const

/** The whole (small) team of the workspace, with roles and state. */
export function useUsers() {
  return useFetch<{ items: UserRow[], total: number }>('/api/users', { key: userKeys.list })
}

export const mailKeys = { list: 'mailbox', message: 'mailbox-message' } as const

/** The local mailbox's messages, for `query` from useListQuery. */
export function useMailbox(query: Query) {
  return useFetch<ListResult<MailItem>>('/api/dev/mail', { key: mailKeys.list, query })
}

/** The open message (by id, or none), fetched again when another is opened. */
export function useMailMessage(id: Readonly<Ref<number | null>>) {
  return useFetch<MailMessage>(() => `/api/dev/mail/${id.value ?? 0}`, { key: mailKeys.message, immediate: !!id.value, watch: [id] })
}

export const activityKeys = { list: 'activity-list' } as const

/** The activity log page, for `query` from useListQuery. */
export function useActivityList(query: Query) {
  return useFetch<ListResult<ActivityRow>>('/api/activity', { key: activityKeys.list, query })
}

export const importKeys = { history: 'imports-history', errors: (id: number | string) => `import-errors-${id}` } as const

/** Earlier imports, newest first, ten a page. */
export function useImportHistory(page: MaybeRefOrGetter<number>) {
  return useFetch<ListResult<ImportSummary>>('/api/imports', { key: importKeys.history, query: { page, pageSize: 10, sort: '-createdAt' } })
}

/** The rows one import refused, 25 a page. */
export function useImportErrors(id: Id, page: MaybeRefOrGetter<number>) {
  return useFetch<ListResult<ImportRowError>>(() => `/api/imports/${toValue(id)}/errors`, { key: importKeys.errors(toValue(id)), query: { page, pageSize: 25 } })
}

/** The portfolio's lists, which a re-check moves together (refresh them with `refreshNuxtData(portfolioKeys.all)`). */
export const portfolioKeys = {
  summary: 'portfolio-summary', units: 'portfolio-units', needsAction: 'portfolio-need', due: 'portfolio-due',
  get all() { return [this.summary, this.needsAction, this.units, this.due] },
} as const

export function usePortfolioSummary(query: Query) {
  return useFetch<PortfolioSummary>('/api/portfolio/summary', { key: portfolioKeys.summary, query })
}

export function usePortfolioUnits(query: Query) {
  return useFetch<ListResult<PortfolioUnitRow>>('/api/portfolio/units', { key: portfolioKeys.units, query })
}

/** Coverings that need action (`needsAction`) or fall due (`due`): two lists of one endpoint, each with its key. */
export function usePortfolioCoverings(list: 'needsAction' | 'due', query: Query) {
  return useFetch<ListResult<PortfolioCoveringRow>>('/api/portfolio/coverings', { key: portfolioKeys[list], query })
}
