import { randomUUID } from 'node:crypto'
import bcrypt from 'bcryptjs'
import type { DataSource } from 'typeorm'
import type { User } from '../../db/entities/index.js'
import { AppError } from '../../lib/app-error.js'
import type { SignUpBody } from './auth-schema.js'
import { usersRepository } from './users-repository.js'

/** Default bcrypt work factor: 12 rounds (OWASP's password storage cheat sheet asks for at least 10). */
export const BCRYPT_COST = 12

/** What the API shows of a user: never the hash. */
export interface PublicUser {
  id: string
  email: string
  name: string
}

export const publicUser = (u: User): PublicUser => ({ id: u.id, email: u.email, name: u.name })

export function authService(dataSource: DataSource, bcryptCost = BCRYPT_COST) {
  const users = usersRepository(dataSource)
  // Compared against when the e-mail is unknown, so a wrong e-mail costs as long as a wrong password.
  const dummyHash = bcrypt.hashSync('veilroom-timing-equaliser', bcryptCost)
  return {
    /** Creates an account; 409 'email_taken' (field email) if the address is registered. */
    async signUp(input: SignUpBody): Promise<PublicUser> {
      if (await users.findByEmail(input.email)) {
        throw new AppError('email_taken', 409, 'An account with this e-mail already exists.', 'email')
      }
      const passwordHash = await bcrypt.hash(input.password, bcryptCost)
      const user = await users.insert({ id: randomUUID(), email: input.email, name: input.name, passwordHash })
      return publicUser(user)
    },

    /** Returns the user when the password matches, else null (the route answers 401). */
    async verify(email: string, password: string): Promise<PublicUser | null> {
      const user = await users.findByEmail(email.trim().toLowerCase())
      const ok = await bcrypt.compare(password, user?.passwordHash ?? dummyHash)
      return user && ok ? publicUser(user) : null
    },

    async findPublic(id: string): Promise<PublicUser | null> {
      const user = await users.findById(id)
      return user ? publicUser(user) : null
    },
  }
}

export type AuthService = ReturnType<typeof authService>
