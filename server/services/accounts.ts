import { createHash, randomBytes } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { User } from '../models'
import { appUrl, sendMail } from './mail'

const WINDOW_MINUTES = 15
export const limits = {
  perAccount: Number(process.env.SIGNIN_MAX_FAILURES_PER_ACCOUNT ?? 5),
  perAddress: Number(process.env.SIGNIN_MAX_FAILURES_PER_ADDRESS ?? 30),
}

export function findUserByEmail(db: Sequelize, email: string) {
  return User.findOne({ where: db.where(db.fn('lower', db.col('email')), email.toLowerCase()) })
}

/** True when either the account or the address has had too many failures in the window. */
export async function signInBlocked(db: Sequelize, email: string, address: string) {
  const rows = await db.query<{ key: string, failures: number }>(
    `SELECT key, count(*)::int AS failures FROM sign_in_attempts
     WHERE key IN (:keys) AND NOT succeeded AND attempted_at > now() - make_interval(mins => :mins) GROUP BY key`,
    { type: QueryTypes.SELECT, replacements: { keys: [`account:${email}`, `address:${address}`], mins: WINDOW_MINUTES } })
  const failures = Object.fromEntries(rows.map(r => [r.key, r.failures]))
  return (failures[`account:${email}`] ?? 0) >= limits.perAccount || (failures[`address:${address}`] ?? 0) >= limits.perAddress
}

export async function recordSignInAttempt(db: Sequelize, email: string, address: string, succeeded: boolean) {
  await db.query(`INSERT INTO sign_in_attempts (key, succeeded) VALUES (:a, :ok), (:b, :ok)`,
    { replacements: { a: `account:${email}`, b: `address:${address}`, ok: succeeded } })
  if (succeeded) {
    // A successful sign-in clears the account's failures, not the address's.
    await db.query(`DELETE FROM sign_in_attempts WHERE key = :a AND NOT succeeded`, { replacements: { a: `account:${email}` } })
  }
}

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex')

/** Issues a one-use token; only its hash is stored. */
export async function issueToken(db: Sequelize, userId: number, purpose: 'invite' | 'reset', hours: number) {
  const token = randomBytes(32).toString('base64url')
  await db.query(`INSERT INTO account_tokens (user_id, purpose, token_hash, expires_at) VALUES (:userId, :purpose, :hash, now() + make_interval(hours => :hours))`,
    { replacements: { userId, purpose, hash: sha256(token), hours } })
  return token
}

/** Marks a valid token used and returns its user id, or null when unknown, used or expired. */
export async function consumeToken(db: Sequelize, token: string, purpose: 'invite' | 'reset') {
  const [rows] = await db.query(`UPDATE account_tokens SET used_at = now()
     WHERE token_hash = :hash AND purpose = :purpose AND used_at IS NULL AND expires_at > now() RETURNING user_id AS "userId"`,
  { replacements: { hash: sha256(token), purpose } }) as [Array<{ userId: number }>, unknown]
  return rows[0]?.userId ?? null
}

export async function sendInvite(db: Sequelize, user: User, workspaceName: string, invitedBy: string) {
  const token = await issueToken(db, user.id, 'invite', 24 * 7)
  const link = appUrl(`/welcome?token=${token}`)
  await sendMail({
    to: user.email,
    subject: `${invitedBy} invited you to ${workspaceName} on Tautline`,
    text: `Hello ${user.name},\n\n${invitedBy} has invited you to join ${workspaceName} on Tautline, the cord-safety register.\n\nChoose your password here (the link works once, for 7 days):\n${link}\n\nIf you did not expect this, ignore this message.`,
  })
}

export async function sendReset(db: Sequelize, user: User) {
  const token = await issueToken(db, user.id, 'reset', 1)
  const link = appUrl(`/reset-password?token=${token}`)
  await sendMail({
    to: user.email,
    subject: 'Reset your Tautline password',
    text: `Hello ${user.name},\n\nSomeone asked to reset the password of this Tautline account. Choose a new one here (the link works once, for 1 hour):\n${link}\n\nIf it was not you, ignore this message; your password stays as it is.`,
  })
}

export async function pruneOldAttempts(db: Sequelize) {
  await db.query(`DELETE FROM sign_in_attempts WHERE attempted_at < now() - interval '1 day'`)
}

/** Opens a server-side session row; the sealed cookie carries only its id and the user's id. */
export async function openSession(db: Sequelize, userId: number) {
  const id = randomBytes(24).toString('base64url')
  await db.query('INSERT INTO user_sessions (id, user_id) VALUES (:id, :userId)', { replacements: { id, userId } })
  return id
}

export async function revokeSessions(db: Sequelize, where: { sessionId?: string, userId?: number }) {
  if (where.sessionId) await db.query('UPDATE user_sessions SET revoked_at = now() WHERE id = :id AND revoked_at IS NULL', { replacements: { id: where.sessionId } })
  if (where.userId) await db.query('UPDATE user_sessions SET revoked_at = now() WHERE user_id = :id AND revoked_at IS NULL', { replacements: { id: where.userId } })
}

/**
 * The active user behind a live session, or null. Checked against the database on every request, so a sign-out,
 * a password reset or a deactivation ends the session at once; `last_seen_at` is written at most once a minute,
 * so that reading a page is not also a write to wait for.
 */
export async function sessionUser(db: Sequelize, sessionId: string, userId: number) {
  const [row] = await db.query<{ id: number, email: string, name: string, role: 'admin' | 'officer' | 'installer' | 'manager', workspaceId: number, clientId: number | null }>(
    `WITH live AS (
       SELECT s.id AS session_id, s.last_seen_at, u.id, u.email, u.name, u.role, u.workspace_id, u.client_id
       FROM user_sessions s JOIN users u ON u.id = s.user_id
       WHERE s.id = :sessionId AND s.user_id = :userId AND s.revoked_at IS NULL AND u.active
         AND s.created_at > now() - interval '12 hours'
     ), seen AS (
       UPDATE user_sessions SET last_seen_at = now()
       WHERE id = (SELECT session_id FROM live WHERE last_seen_at < now() - interval '1 minute')
     )
     SELECT id, email, name, role, workspace_id AS "workspaceId", client_id AS "clientId" FROM live`,
    { type: QueryTypes.SELECT, replacements: { sessionId, userId } })
  return row ?? null
}
