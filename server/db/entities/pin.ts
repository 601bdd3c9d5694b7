import { EntitySchema } from 'typeorm'
import type { Room } from './room.js'
import type { User } from './user.js'

/** A review comment anchored to a 3D point (metres) of the surface at a given document version. */
export interface Pin {
  id: string
  roomId: string
  authorId: string | null
  x: number
  y: number
  z: number
  docVersion: number
  body: string
  resolved: boolean
  createdAt: Date
  room?: Room
  author?: User | null
}

export interface PinReply {
  id: string
  pinId: string
  authorId: string | null
  body: string
  createdAt: Date
  pin?: Pin
  author?: User | null
}

const author = {
  type: 'many-to-one',
  target: 'User',
  joinColumn: { name: 'author_id' },
  onDelete: 'SET NULL',
  nullable: true,
} as const

export const PinEntity = new EntitySchema<Pin>({
  name: 'Pin',
  tableName: 'pins',
  columns: {
    id: { type: 'char', length: 36, primary: true },
    roomId: { type: 'char', length: 36, name: 'room_id' },
    authorId: { type: 'char', length: 36, name: 'author_id', nullable: true },
    x: { type: 'double' },
    y: { type: 'double' },
    z: { type: 'double' },
    docVersion: { type: 'int', unsigned: true, name: 'doc_version' },
    body: { type: 'text' },
    resolved: { type: 'boolean', default: false },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
  relations: {
    room: { type: 'many-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
    author,
  },
})

export const PinReplyEntity = new EntitySchema<PinReply>({
  name: 'PinReply',
  tableName: 'pin_replies',
  columns: {
    id: { type: 'char', length: 36, primary: true },
    pinId: { type: 'char', length: 36, name: 'pin_id' },
    authorId: { type: 'char', length: 36, name: 'author_id', nullable: true },
    body: { type: 'text' },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
  relations: {
    pin: { type: 'many-to-one', target: 'Pin', joinColumn: { name: 'pin_id' }, onDelete: 'CASCADE' },
    author,
  },
})
