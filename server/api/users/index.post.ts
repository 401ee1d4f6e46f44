import { inviteSchema } from '#shared/schemas/auth'
import { User, Workspace } from '../../models'
import { findUserByEmail, sendInvite } from '../../services/accounts'
import { logActivity } from '../../services/activity'

// Admins invite people by e-mail; the invitee chooses a password through a one-use link.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, ['admin'])
  const body = await readValidatedBody(event, validateWith(inviteSchema))
  const db = useDb()
  if (body.clientId) await requireClientAccess(event, body.clientId)
  if (await findUserByEmail(db, body.email)) {
    throw createError({ statusCode: 409, message: 'email: this address already has an account', data: { fields: { email: 'already has an account' } } })
  }
  const user = await uniqueOr409(() => User.create({ workspaceId: admin.workspaceId, clientId: body.clientId ?? null, email: body.email,
    name: body.name, role: body.role, passwordHash: null, lastSignInAt: null }), 'email', 'account')
  const workspace = await Workspace.findByPk(admin.workspaceId)
  await sendInvite(db, user, workspace?.name ?? 'your team', admin.name)
  await logActivity({ workspaceId: admin.workspaceId, userId: admin.id, action: 'user.invited', entity: 'user', entityId: user.id, detail: { email: user.email, role: user.role } })
  setResponseStatus(event, 201)
  return { id: user.id, email: user.email, name: user.name, role: user.role, clientId: user.clientId, invitePending: true }
})
