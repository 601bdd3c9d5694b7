import { EntitySchema } from 'typeorm'

// Entities are EntitySchema objects, not decorated classes: tsx and vitest transpile without
// emitDecoratorMetadata, so nothing here depends on reflected types.

export interface User {
  id: string
  email: string
  name: string
  passwordHash: string
  createdAt: Date
}

export const UserEntity = new EntitySchema<User>({
  name: 'User',
  tableName: 'users',
  columns: {
    id: { type: 'char', length: 36, primary: true },
    email: { type: 'varchar', length: 254, unique: true },
    name: { type: 'varchar', length: 120 },
    passwordHash: { type: 'varchar', length: 100, name: 'password_hash' },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
})
