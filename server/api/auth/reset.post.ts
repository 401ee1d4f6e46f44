import { tokenPasswordSchema } from '#shared/schemas/auth'
import { User } from '../../models'
import { consumeToken, revokeSessions } from '../../services/accounts'
import { logActivity } from '../../services/activity'

export default defineEventHandler(async (event) => {
  const { token, password } = await readValidatedBody(event, validateWith(tokenPasswordSchema))
  const db = useDb()
  const passwordHash = await hashPassword(password)
  const userId = await consumeToken(db, token, 'reset')
  const user = userId ? await User.findByPk(userId) : null
  if (!user || !user.active) throw createError({ statusCode: 400, message: 'token: this reset link has expired or was already used; ask for a new one', data: { fields: { token: 'expired or used' } } })
  await user.update({ passwordHash })
  // A new password ends every session the old one opened.
  await revokeSessions(db, { userId: user.id })
  await logActivity({ workspaceId: user.workspaceId, userId: user.id, action: 'user.password_reset', entity: 'user', entityId: user.id })
  return { ok: true }
})
