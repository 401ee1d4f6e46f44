import { resetRequestSchema } from '#shared/schemas/auth'
import { findUserByEmail, sendReset } from '../../services/accounts'

// Always the same answer, so the reply never tells whether an account exists.
export default defineEventHandler(async (event) => {
  const { email } = await readValidatedBody(event, validateWith(resetRequestSchema))
  const db = useDb()
  const user = await findUserByEmail(db, email)
  if (user?.active) await sendReset(db, user)
  return { ok: true, message: 'If that address belongs to an account, a reset link is on its way.' }
})
