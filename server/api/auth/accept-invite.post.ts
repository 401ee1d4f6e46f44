import { tokenPasswordSchema } from '#shared/schemas/auth'
import { redeemToken } from '../../services/accounts'
import { logActivity } from '../../services/activity'

// Choosing the first password spends the invitation and revokes any other live link of the person.
export default defineEventHandler(async (event) => {
  const { token, password, name } = await readValidatedBody(event, validateWith(tokenPasswordSchema))
  const passwordHash = await hashPassword(password)
  const user = await redeemToken(useDb(), token, 'invite', passwordHash, name)
  if (!user) throw createError({ statusCode: 400, message: 'token: this invitation has expired or was already used; ask your admin for a new one', data: { fields: { token: 'expired or used' } } })
  await logActivity({ workspaceId: user.workspaceId, userId: user.id, action: 'user.invite_accepted', entity: 'user', entityId: user.id })
  return { ok: true, email: user.email }
})
