import type { H3Event } from 'h3'
import type { User as SessionUser } from '#auth-utils'
import type { Role } from '#shared/schemas/common'
import { sessionUser } from '../services/accounts'

/**
 * Guard: a signed-in, still active user with a live session. The session row is checked on every
 * request, so signing out, a password reset or a deactivated account takes effect at once.
 */
export async function requireUser(event: H3Event): Promise<SessionUser> {
  if (event.context.tautlineUser) return event.context.tautlineUser as SessionUser
  const session = await getUserSession(event)
  const sid = session.sid as string | undefined
  const id = session.user?.id
  if (!id || !sid) throw createError({ statusCode: 401, message: 'Sign in to continue' })
  const user = await sessionUser(useDb(), sid, id)
  if (!user) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Your session has ended; sign in again' })
  }
  event.context.tautlineUser = user
  event.context.tautlineSessionId = sid
  return user
}

/** Guard: the signed-in user holds one of the given roles (403 otherwise). */
export async function requireRole(event: H3Event, roles: readonly Role[]): Promise<SessionUser> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) {
    throw createError({ statusCode: 403, message: `This needs the ${roles.join(' or ')} role` })
  }
  return user
}
