import { EntitySchema } from 'typeorm'
import type { Room, RoomRole } from './room.js'
import { roomRoles } from './room.js'
import type { User } from './user.js'

/** An e-mailed invitation; only a hash of the token is stored, the link carries the token. */
export interface Invite {
  id: string
  roomId: string
  email: string
  role: RoomRole
  tokenHash: string
  expiresAt: Date
  acceptedAt: Date | null
  revokedAt: Date | null
  invitedById: string
  createdAt: Date
  room?: Room
  invitedBy?: User
}

export const InviteEntity = new EntitySchema<Invite>({
  name: 'Invite',
  tableName: 'invites',
  columns: {
    id: { type: 'char', length: 36, primary: true },
    roomId: { type: 'char', length: 36, name: 'room_id' },
    email: { type: 'varchar', length: 254 },
    role: { type: 'enum', enum: [...roomRoles] },
    tokenHash: { type: 'char', length: 64, name: 'token_hash', unique: true },
    expiresAt: { type: 'datetime', precision: 3, name: 'expires_at' },
    acceptedAt: { type: 'datetime', precision: 3, name: 'accepted_at', nullable: true },
    revokedAt: { type: 'datetime', precision: 3, name: 'revoked_at', nullable: true },
    invitedById: { type: 'char', length: 36, name: 'invited_by' },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
  relations: {
    room: { type: 'many-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
    invitedBy: { type: 'many-to-one', target: 'User', joinColumn: { name: 'invited_by' }, onDelete: 'CASCADE' },
  },
})
