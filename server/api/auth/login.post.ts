import { loginSchema } from '#shared/schemas/auth'
import { admitSignIn, findUserByEmail, openSession, signInSucceeded } from '../../services/accounts'
import { logActivity } from '../../services/activity'

// A hash to verify against when the e-mail is unknown, so both paths take the same time.
let decoyHash: Promise<string> | undefined

export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, validateWith(loginSchema))
  const db = useDb()
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
  // Counted before the password is checked: an attempt past the limit is never checked at all.
  const gate = await admitSignIn(db, email, address)
  if (!gate.admitted) {
    setResponseHeader(event, 'retry-after', gate.retryAfterS)
    throw createError({ statusCode: 429, message: gate.message, data: { retryAfterS: gate.retryAfterS } })
  }
  const user = await findUserByEmail(db, email)
  decoyHash ??= hashPassword('decoy-password-never-used')
  const ok = await verifyPassword(user?.passwordHash ?? await decoyHash, password) && !!user?.active && !!user.passwordHash
  if (!ok || !user) throw createError({ statusCode: 401, message: 'That e-mail and password do not match an active account.' })
  await signInSucceeded(db, email, address)

  const sessionUser = { id: user.id, email: user.email, name: user.name, role: user.role, workspaceId: user.workspaceId, clientId: user.clientId }
  const sid = await openSession(db, user.id)
  await replaceUserSession(event, { user: sessionUser, sid, signedInAt: new Date().toISOString() })
  await user.update({ lastSignInAt: new Date() })
  await logActivity({ workspaceId: user.workspaceId, userId: user.id, action: 'user.sign_in', entity: 'user', entityId: user.id })
  return { user: sessionUser }
})
