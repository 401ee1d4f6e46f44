import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'

// Reads the tamper-evidence chains back (see migration 0009): the database recomputes every evidence row's
// SHA-256 and every block link, and names, per table, the first row that no longer matches.

export interface ChainTable {
  table: string
  rows: number
  blocks: number
  problems: number
}

export interface ChainBreak {
  table: string
  /** The row's id (inspection_photos: inspection id/photo id). Null when only a chain head is off. */
  id: string | null
  workspaceId: number
  problem: string
}

export interface ChainReport {
  intact: boolean
  rows: number
  tables: ChainTable[]
  /** The first row that no longer matches, in table order; null when every chain verifies. */
  firstBreak: ChainBreak | null
  /** Every break, one per table at most (the first of each). */
  breaks: ChainBreak[]
}

interface VerifyRow {
  table_name: string
  rows_checked: number | string
  blocks: number | string
  problems: number | string
  workspace_id: number | null
  row_key: string | null
  problem: string | null
}

/** Recomputes the chains of every workspace, or of one. Reads only; safe to run at any time. */
export async function verifyEvidence(db: Sequelize, options: { workspaceId?: number, timeoutMs?: number } = {}): Promise<ChainReport> {
  const rows = await db.transaction(async (transaction) => {
    if (options.timeoutMs) await db.query(`SET LOCAL statement_timeout = ${Math.max(1, Math.floor(options.timeoutMs))}`, { transaction })
    return db.query<VerifyRow>('SELECT * FROM tautline_evidence_verify(:ws)', { type: QueryTypes.SELECT, transaction, replacements: { ws: options.workspaceId ?? null } })
  })
  const tables = rows.map(r => ({ table: r.table_name, rows: Number(r.rows_checked), blocks: Number(r.blocks), problems: Number(r.problems) }))
  const breaks = rows.filter(r => r.problem !== null).map(r => ({ table: r.table_name, id: r.row_key, workspaceId: r.workspace_id!, problem: r.problem! }))
  return { intact: breaks.length === 0, rows: tables.reduce((n, t) => n + t.rows, 0), tables, firstBreak: breaks[0] ?? null, breaks }
}

/** One fingerprint of every chain head: noted down somewhere else, it shows later whether history was rewritten wholesale. */
export async function chainFingerprint(db: Sequelize): Promise<string> {
  const [row] = await db.query<{ fingerprint: string }>(`SELECT encode(sha256(convert_to(coalesce(string_agg(table_name || ' ' || workspace_id || ' ' || seq || ' ' || hash, E'\\n'
    ORDER BY table_name, workspace_id), ''), 'UTF8')), 'hex') AS fingerprint FROM evidence_chain_heads`, { type: QueryTypes.SELECT })
  return row!.fingerprint
}

/** "inspections id 17 in workspace 2: the row's content changed since it was recorded" */
export function describeBreak(b: ChainBreak): string {
  return `${b.table}${b.id === null ? '' : ` id ${b.id}`} in workspace ${b.workspaceId}: ${b.problem}`
}
