import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

// The same scrypt settings nuxt-auth-utils uses by default, for scripts that run outside the server.
const hash = new Hash(new Scrypt({}))

export function hashPasswordOffline(password: string) {
  return hash.make(password)
}
