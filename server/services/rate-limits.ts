import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'

// Fixed-window counters, one row per key. A hit is counted by an upsert that returns the new count, under the
// row lock PostgreSQL takes for ON CONFLICT DO UPDATE, so concurrent requests are counted one after the other
// BEFORE the work they guard is done: twelve at once see the counts 1 to 12, never twelve times the same one.

export interface Count { key: string, hits: number, retryAfterS: number }

/** A whole number from the environment, or the default when unset or not a positive number. */
export function envLimit(name: string, fallback: number): number {
  const v = Number(process.env[name])
  return Number.isInteger(v) && v > 0 ? v : fallback
}

/** Counts one hit on each key in a window of `minutes`; returns each key's count and the seconds until its window ends. */
export async function countHits(db: Sequelize, keys: string[], minutes: number): Promise<Map<string, Count>> {
  // Keys are locked in one order by every caller, so two requests sharing keys never deadlock.
  const sorted = [...new Set(keys)].sort()
  const rows = await db.query<Count>(`
    INSERT INTO rate_limits AS l (key, hits, window_started_at)
    SELECT k, 1, now() FROM unnest(CAST(ARRAY[:keys] AS text[])) AS k ORDER BY k
    ON CONFLICT (key) DO UPDATE SET
      hits = CASE WHEN l.window_started_at <= now() - make_interval(mins => :minutes) THEN 1 ELSE l.hits + 1 END,
      window_started_at = CASE WHEN l.window_started_at <= now() - make_interval(mins => :minutes) THEN now() ELSE l.window_started_at END
    RETURNING key, hits, greatest(1, ceil(extract(epoch FROM window_started_at + make_interval(mins => :minutes) - now())))::int AS "retryAfterS"`,
  { type: QueryTypes.SELECT, replacements: { keys: sorted, minutes } })
  return new Map(rows.map(r => [r.key, r]))
}

/** Takes back one hit from each key (an attempt that turned out not to count). */
export async function refundHits(db: Sequelize, keys: string[]) {
  if (!keys.length) return
  await db.query('UPDATE rate_limits SET hits = greatest(hits - 1, 0) WHERE key IN (:keys)', { replacements: { keys } })
}

/** Forgets the keys altogether (a success that ends a run of failures). */
export async function clearHits(db: Sequelize, keys: string[]) {
  if (!keys.length) return
  await db.query('DELETE FROM rate_limits WHERE key IN (:keys)', { replacements: { keys } })
}

/** Forgets every key that starts with `prefix`. */
export async function clearHitsLike(db: Sequelize, prefix: string) {
  await db.query(`DELETE FROM rate_limits WHERE key LIKE :pattern`, { replacements: { pattern: `${prefix.replace(/[\\%_]/g, c => `\\${c}`)}%` } })
}

/** Rows whose window ended long ago say nothing any more. */
export async function pruneRateLimits(db: Sequelize) {
  await db.query(`DELETE FROM rate_limits WHERE window_started_at < now() - interval '1 day'`)
}

/** "3 minutes", "1 minute": the wait a person is told, rounded up to whole minutes. */
export function minutesText(seconds: number): string {
  const m = Math.max(1, Math.ceil(seconds / 60))
  return `${m} minute${m === 1 ? '' : 's'}`
}
