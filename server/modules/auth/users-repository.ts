import type { DataSource } from 'typeorm'
import { UserEntity, type User } from '../../db/entities/index.js'

/** Queries on users; e-mails are stored lower-cased, so lookups are exact. */
export function usersRepository(dataSource: DataSource) {
  const repo = dataSource.getRepository(UserEntity)
  return {
    findById: (id: string) => repo.findOneBy({ id }),
    findByEmail: (email: string) => repo.findOneBy({ email }),
    insert: async (user: Omit<User, 'createdAt'>): Promise<User> => repo.save(repo.create(user)),
  }
}

export type UsersRepository = ReturnType<typeof usersRepository>
