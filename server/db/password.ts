import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

// The same scrypt hasher (and default parameters) nuxt-auth-utils uses, for scripts that run
// outside Nitro (seeding from the command line). Hashes made here verify with verifyPassword().
const hasher = new Hash(new Scrypt({}))

export const hashPasswordOffline = (password: string) => hasher.make(password)
