import { revokeSessions } from '../../services/accounts'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  await revokeSessions(useDb(), { sessionId: event.context.tautlineSessionId as string })
  await clearUserSession(event)
  return { ok: true }
})
