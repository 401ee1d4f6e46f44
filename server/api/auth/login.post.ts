import { loginSchema } from '#shared/schemas/auth'
import { findUserByEmail, openSession, recordSignInAttempt, signInBlocked } from '../../services/accounts'
import { logActivity } from '../../services/activity'

// A hash to verify against when the e-mail is unknown, so both paths take the same time.
let decoyHash: Promise<string> | undefined

export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, validateWith(loginSchema))
  const db = useDb()
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
  if (await signInBlocked(db, email, address)) {
    throw createError({ statusCode: 429, message: 'Too many sign-in attempts. Wait 15 minutes, or reset your password.' })
  }
  const user = await findUserByEmail(db, email)
  decoyHash ??= hashPassword('decoy-password-never-used')
  const ok = await verifyPassword(user?.passwordHash ?? await decoyHash, password) && !!user?.active && !!user.passwordHash
  await recordSignInAttempt(db, email, address, ok)
  if (!ok || !user) throw createError({ statusCode: 401, message: 'That e-mail and password do not match an active account.' })

  const sessionUser = { id: user.id, email: user.email, name: user.name, role: user.role, workspaceId: user.workspaceId, clientId: user.clientId }
  const sid = await openSession(db, user.id)
  await replaceUserSession(event, { user: sessionUser, sid, signedInAt: new Date().toISOString() })
  await user.update({ lastSignInAt: new Date() })
  await logActivity({ workspaceId: user.workspaceId, userId: user.id, action: 'user.sign_in', entity: 'user', entityId: user.id })
  return { user: sessionUser }
})
