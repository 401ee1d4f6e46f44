import { tokenPasswordSchema } from '#shared/schemas/auth'
import { User } from '../../models'
import { consumeToken } from '../../services/accounts'
import { logActivity } from '../../services/activity'

export default defineEventHandler(async (event) => {
  const { token, password, name } = await readValidatedBody(event, validateWith(tokenPasswordSchema))
  const db = useDb()
  const passwordHash = await hashPassword(password)
  const userId = await consumeToken(db, token, 'invite')
  const user = userId ? await User.findByPk(userId) : null
  if (!user || !user.active) throw createError({ statusCode: 400, message: 'token: this invitation has expired or was already used; ask your admin for a new one', data: { fields: { token: 'expired or used' } } })
  await user.update({ passwordHash, ...(name ? { name } : {}) })
  await logActivity({ workspaceId: user.workspaceId, userId: user.id, action: 'user.invite_accepted', entity: 'user', entityId: user.id })
  return { ok: true, email: user.email }
})
