import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import type { ListResult } from '../../shared/schemas/common'

// The one way a list is paged: the page of rows and the count of all matching rows, in one round trip each.

export interface PageRequest { page: number, pageSize: number }

/**
 * `SELECT select FROM from WHERE where ORDER BY order` one page at a time, with the total of matching rows.
 * `countFrom` counts over fewer tables when the extra joins only add columns (they never drop or repeat a row).
 */
export async function paged<T extends object>(db: Sequelize, select: string, from: string, where: string[], order: string,
  replacements: Record<string, unknown>, p: PageRequest, countFrom = from): Promise<ListResult<T>> {
  const whereSql = where.length ? `WHERE ${where.join(' AND ')}` : ''
  const [items, [count]] = await Promise.all([
    db.query<T>(`SELECT ${select} FROM ${from} ${whereSql} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
      { type: QueryTypes.SELECT, replacements: { ...replacements, limit: p.pageSize, offset: (p.page - 1) * p.pageSize } }),
    db.query<{ total: number }>(`SELECT count(*)::int AS total FROM ${countFrom} ${whereSql}`, { type: QueryTypes.SELECT, replacements }),
  ])
  return { items, total: count?.total ?? 0, page: p.page, pageSize: p.pageSize }
}
