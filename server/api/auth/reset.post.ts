import { tokenPasswordSchema } from '#shared/schemas/auth'
import { redeemToken } from '../../services/accounts'
import { logActivity } from '../../services/activity'

// A new password spends this link, revokes every other live link of the person and ends all their sessions.
export default defineEventHandler(async (event) => {
  const { token, password } = await readValidatedBody(event, validateWith(tokenPasswordSchema))
  const passwordHash = await hashPassword(password)
  const user = await redeemToken(useDb(), token, 'reset', passwordHash)
  if (!user) throw createError({ statusCode: 400, message: 'token: this reset link has expired or was already used; ask for a new one', data: { fields: { token: 'expired or used' } } })
  await logActivity({ workspaceId: user.workspaceId, userId: user.id, action: 'user.password_reset', entity: 'user', entityId: user.id })
  return { ok: true }
})
