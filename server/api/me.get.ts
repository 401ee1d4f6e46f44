import { Client, Workspace } from '../models'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const [workspace, client] = await Promise.all([
    Workspace.findByPk(user.workspaceId, { attributes: ['id', 'name'] }),
    user.clientId ? Client.findByPk(user.clientId, { attributes: ['id', 'name'] }) : null,
  ])
  return { user, workspace: workspace?.toJSON() ?? null, client: client?.toJSON() ?? null }
})
