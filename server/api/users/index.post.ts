import { canAdminister } from '#shared/access'
import { inviteSchema } from '#shared/schemas/auth'
import { Workspace } from '../../models'
import { createInvitedUser, sendInvite } from '../../services/accounts'
import { logActivity } from '../../services/activity'

// Admins invite people by e-mail; the invitee chooses a password through a one-use link.
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, canAdminister)
  const body = await readValidatedBody(event, validateWith(inviteSchema))
  const db = useDb()
  if (body.clientId) await requireClientAccess(event, body.clientId)
  const user = await createInvitedUser(db, admin.workspaceId, body)
  const workspace = await Workspace.findByPk(admin.workspaceId)
  await sendInvite(db, user, workspace?.name ?? 'your team', admin)
  await logActivity({ workspaceId: admin.workspaceId, userId: admin.id, action: 'user.invited', entity: 'user', entityId: user.id, detail: { email: user.email, role: user.role } })
  setResponseStatus(event, 201)
  return { id: user.id, email: user.email, name: user.name, role: user.role, clientId: user.clientId, invitePending: true }
})
