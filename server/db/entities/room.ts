import { EntitySchema } from 'typeorm'
import type { User } from './user.js'
import { roomRoles, type RoomRole } from '../../../shared/protocol/roles.js'

// What each role may do: shared/protocol/roles.ts.
export { roomRoles, type RoomRole }

export interface Room {
  id: string
  name: string
  description: string
  createdAt: Date
  updatedAt: Date
}

export interface Membership {
  id: string
  roomId: string
  userId: string
  role: RoomRole
  createdAt: Date
  room?: Room
  user?: User
}

const uuid = { type: 'char', length: 36 } as const

export const RoomEntity = new EntitySchema<Room>({
  name: 'Room',
  tableName: 'rooms',
  columns: {
    id: { ...uuid, primary: true },
    name: { type: 'varchar', length: 120 },
    description: { type: 'text' },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
    updatedAt: { type: 'datetime', precision: 3, name: 'updated_at', updateDate: true },
  },
})

export const MembershipEntity = new EntitySchema<Membership>({
  name: 'Membership',
  tableName: 'memberships',
  columns: {
    id: { ...uuid, primary: true },
    roomId: { ...uuid, name: 'room_id' },
    userId: { ...uuid, name: 'user_id' },
    role: { type: 'enum', enum: [...roomRoles] },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
  uniques: [{ name: 'uq_memberships_room_user', columns: ['roomId', 'userId'] }],
  relations: {
    room: { type: 'many-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
    user: { type: 'many-to-one', target: 'User', joinColumn: { name: 'user_id' }, onDelete: 'CASCADE' },
  },
})
