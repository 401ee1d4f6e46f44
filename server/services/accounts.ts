import { createHash, randomBytes } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import type { Sequelize, Transaction } from 'sequelize'
import { User } from '../models'
import { appUrl, sendRecordedMail } from './mail'
import { clearHits, clearHitsLike, countHits, envLimit, minutesText, refundHits } from './rate-limits'
import { Refusal } from '../utils/refusal'

/** Sign-in limits (failures in a window of SIGNIN_WINDOW_MINUTES, 15 by default). */
export const SIGNIN_WINDOW_MINUTES = envLimit('SIGNIN_WINDOW_MINUTES', 15)
export const limits = {
  /** One account from one address: stops a guesser at a keyboard. */
  perAccountAndAddress: envLimit('SIGNIN_MAX_FAILURES_PER_ACCOUNT_AND_ADDRESS', 5),
  /** One account from anywhere: stops guessing spread over many addresses. */
  perAccount: envLimit('SIGNIN_MAX_FAILURES_PER_ACCOUNT', 20),
  /** Every account from one address: a ceiling well above what an office sharing one connection gets wrong. */
  perAddress: envLimit('SIGNIN_MAX_FAILURES_PER_ADDRESS', 300),
}

export function findUserByEmail(db: Sequelize, email: string) {
  return User.findOne({ where: db.where(db.fn('lower', db.col('email')), email.toLowerCase()) })
}

const signInKeys = (email: string, address: string) => {
  const account = email.toLowerCase()
  return { accountAndAddress: `signin:account-address:${account}|${address}`, account: `signin:account:${account}`, address: `signin:address:${address}` }
}

export type SignInGate = { admitted: true } | { admitted: false, message: string, retryAfterS: number }

/**
 * Counts this attempt BEFORE its password is checked, so concurrent attempts cannot all slip under the limit;
 * an attempt past a limit is refused unchecked. The words are the same whether or not the account exists.
 */
export async function admitSignIn(db: Sequelize, email: string, address: string): Promise<SignInGate> {
  const keys = signInKeys(email, address)
  const counts = await countHits(db, Object.values(keys), SIGNIN_WINDOW_MINUTES)
  const over = (key: string, limit: number) => (counts.get(key)?.hits ?? 0) > limit
  const accountOver = over(keys.accountAndAddress, limits.perAccountAndAddress) || over(keys.account, limits.perAccount)
  const addressOver = over(keys.address, limits.perAddress)
  if (!accountOver && !addressOver) return { admitted: true }
  // A refused attempt feeds only the counters that refused it, so one locked account does not use up the office's ceiling.
  const blocking = [
    ...(over(keys.accountAndAddress, limits.perAccountAndAddress) ? [keys.accountAndAddress] : []),
    ...(over(keys.account, limits.perAccount) ? [keys.account] : []),
    ...(addressOver ? [keys.address] : []),
  ]
  await refundHits(db, Object.values(keys).filter(k => !blocking.includes(k)))
  const retryAfterS = Math.max(...blocking.map(k => counts.get(k)!.retryAfterS))
  const message = addressOver
    // Every account on this connection is paused: a password reset would not change that, so none is offered.
    ? `Too many sign-in attempts from this network. Try again in ${minutesText(retryAfterS)}.`
    // A reset clears the account's count, so it is an honest way in sooner for the person who owns the mailbox.
    : `Too many sign-in attempts for this account. Try again in ${minutesText(retryAfterS)}, or reset your password to sign in now.`
  return { admitted: false, message, retryAfterS }
}

/**
 * A success ends the account's run of failures from this address (a guesser elsewhere keeps theirs) and is not
 * counted against the address.
 */
export async function signInSucceeded(db: Sequelize, email: string, address: string) {
  const keys = signInKeys(email, address)
  await clearHits(db, [keys.account, keys.accountAndAddress])
  await refundHits(db, [keys.address])
}

/** A new password (reset or first one) ends the lock-out on the account, from every address. */
async function clearAccountLock(db: Sequelize, email: string) {
  await clearHits(db, [signInKeys(email, '').account])
  await clearHitsLike(db, `signin:account-address:${email.toLowerCase()}|`)
}

/** Reset mail: at most RESET_REQUESTS_PER_ADDRESS requests from one address in 15 minutes, RESET_MAILS_PER_ACCOUNT mails to an account an hour. */
export const resetLimits = {
  perAddress: envLimit('RESET_REQUESTS_PER_ADDRESS', 10),
  perAccount: envLimit('RESET_MAILS_PER_ACCOUNT', 3),
}

/**
 * A reset request. Refused (429) only by the address's count, which grows alike for addresses with and without an
 * account; past the account's count no mail goes, and the answer stays the same, so it never tells who exists.
 */
export async function requestReset(db: Sequelize, email: string, address: string): Promise<{ refused: false } | { refused: true, message: string, retryAfterS: number }> {
  const byAddress = (await countHits(db, [`reset:address:${address}`], 15)).get(`reset:address:${address}`)!
  if (byAddress.hits > resetLimits.perAddress) {
    return { refused: true, retryAfterS: byAddress.retryAfterS, message: `Too many reset requests from this network. Try again in ${minutesText(byAddress.retryAfterS)}.` }
  }
  const key = `reset:account:${email.toLowerCase()}`
  const byAccount = (await countHits(db, [key], 60)).get(key)!
  if (byAccount.hits > resetLimits.perAccount) return { refused: false }
  const user = await findUserByEmail(db, email)
  // Sent after the answer, so neither its time nor a relay failure tells whether the account exists; a failure is
  // recorded against the account's workspace.
  if (user?.active) {
    sendReset(db, user).catch(err => console.error('[tautline] reset mail not sent:', (err as Error).message))
  }
  return { refused: false }
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
export async function consumeToken(db: Sequelize, token: string, purpose: 'invite' | 'reset', transaction?: Transaction) {
  const [rows] = await db.query(`UPDATE account_tokens SET used_at = now()
     WHERE token_hash = :hash AND purpose = :purpose AND used_at IS NULL AND expires_at > now() RETURNING user_id AS "userId"`,
  { replacements: { hash: sha256(token), purpose }, transaction }) as [Array<{ userId: number }>, unknown]
  return rows[0]?.userId ?? null
}

/**
 * Sets a password through a one-use link (an invitation or a reset), all or nothing: the token is spent, every
 * other live link of the person is revoked (an older reset mail, a second invitation), every session they had
 * is ended, and the account's sign-in lock is lifted. Returns null when the link is unknown, used, expired or
 * its account is inactive.
 */
export async function redeemToken(db: Sequelize, token: string, purpose: 'invite' | 'reset', passwordHash: string, name?: string) {
  const user = await db.transaction(async (transaction) => {
    const userId = await consumeToken(db, token, purpose, transaction)
    if (!userId) return null
    const [found] = await db.query<{ id: number, email: string, workspaceId: number }>(`UPDATE users SET password_hash = :passwordHash,
        name = coalesce(:name, name), updated_at = now() WHERE id = :userId AND active
      RETURNING id, email, workspace_id AS "workspaceId"`, { type: QueryTypes.SELECT, replacements: { userId, passwordHash, name: name ?? null }, transaction })
    if (!found) return null
    await db.query('UPDATE account_tokens SET used_at = now() WHERE user_id = :userId AND used_at IS NULL', { replacements: { userId }, transaction })
    await db.query('UPDATE user_sessions SET revoked_at = now() WHERE user_id = :userId AND revoked_at IS NULL', { replacements: { userId }, transaction })
    return found
  })
  if (user) await clearAccountLock(db, user.email)
  return user
}

export async function sendInvite(db: Sequelize, user: User, workspaceName: string, invitedBy: { id: number, name: string }) {
  const token = await issueToken(db, user.id, 'invite', 24 * 7)
  const link = appUrl(`/welcome?token=${token}`)
  await sendRecordedMail(db, { workspaceId: user.workspaceId, causedBy: invitedBy.id, kind: 'invite' }, {
    to: user.email,
    subject: `${invitedBy.name} invited you to ${workspaceName} on Tautline`,
    text: `Hello ${user.name},\n\n${invitedBy.name} has invited you to join ${workspaceName} on Tautline, the cord-safety register.\n\nChoose your password here (the link works once, for 7 days):\n${link}\n\nIf you did not expect this, ignore this message.`,
  })
}

/** The reset mail belongs to the account's workspace; nobody signed in caused it. */
export async function sendReset(db: Sequelize, user: User) {
  const token = await issueToken(db, user.id, 'reset', 1)
  const link = appUrl(`/reset-password?token=${token}`)
  await sendRecordedMail(db, { workspaceId: user.workspaceId, causedBy: null, kind: 'reset' }, {
    to: user.email,
    subject: 'Reset your Tautline password',
    text: `Hello ${user.name},\n\nSomeone asked to reset the password of this Tautline account. Choose a new one here (the link works once, for 1 hour):\n${link}\n\nIf it was not you, ignore this message; your password stays as it is.`,
  })
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

/** Role mailboxes (RFC 2142 and the usual automatic senders) are nobody's sign-in, so Tautline never invites them. */
const ROLE_MAILBOXES = new Set(['postmaster', 'abuse', 'hostmaster', 'webmaster', 'noc', 'security', 'root', 'mailer-daemon', 'no-reply', 'noreply', 'do-not-reply', 'donotreply'])

function senderAddress(): string {
  const from = process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>'
  return (from.match(/<([^>]+)>/)?.[1] ?? from).trim().toLowerCase()
}

/** The form marks the field without repeating the sentence: the person is already here, or cannot be invited. */
export class InviteRefused extends Refusal {
  constructor(field: string, message: string, statusCode: number) {
    super(statusCode, field, message, { [field]: statusCode === 409 ? 'already in your workspace' : 'cannot be invited' })
  }
}

/**
 * The one answer for an address that cannot be invited from this workspace: a role mailbox, Tautline's own
 * sender, or an address someone already signs in with in another workspace. The words and status are the same
 * in every case, so the answer never tells whether (or where) an address is in use.
 */
export const CANNOT_INVITE = 'email: this address cannot be invited. Ask the person for another address to sign in with.'

/** Creates the invited account, or refuses; an address of this workspace's own people is named as such. */
export async function createInvitedUser(db: Sequelize, workspaceId: number, body: { email: string, name: string, role: User['role'], clientId?: number | null }) {
  const email = body.email.toLowerCase()
  const existing = await findUserByEmail(db, email)
  if (existing && existing.workspaceId === workspaceId) {
    throw new InviteRefused('email', 'email: someone in your workspace already signs in with this address; find them under Users', 409)
  }
  if (existing || ROLE_MAILBOXES.has(email.split('@')[0]!) || email === senderAddress()) throw new InviteRefused('email', CANNOT_INVITE, 422)
  try {
    return await User.create({ workspaceId, clientId: body.clientId ?? null, email: body.email, name: body.name, role: body.role, passwordHash: null, lastSignInAt: null })
  }
  catch (err) {
    // Taken between the check and the insert, perhaps by another workspace: the same neutral answer.
    if ((err as Error).name === 'SequelizeUniqueConstraintError') throw new InviteRefused('email', CANNOT_INVITE, 422)
    throw err
  }
}
