import { resetRequestSchema } from '#shared/schemas/auth'
import { requestReset } from '../../services/accounts'

// Always the same answer whether or not the account exists; only the address's own count can refuse it.
export default defineEventHandler(async (event) => {
  const { email } = await readValidatedBody(event, validateWith(resetRequestSchema))
  const address = getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === '1' }) ?? 'unknown'
  const outcome = await requestReset(useDb(), email, address)
  if (outcome.refused) {
    setResponseHeader(event, 'retry-after', outcome.retryAfterS)
    throw createError({ statusCode: 429, message: outcome.message, data: { retryAfterS: outcome.retryAfterS } })
  }
  return { ok: true, message: 'If that address belongs to an account, a reset link is on its way.' }
})
