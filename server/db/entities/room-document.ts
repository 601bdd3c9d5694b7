import { EntitySchema } from 'typeorm'
import type { Room } from './room.js'

/** The room's shared (yjs) document, stored as one merged V1 update. */
export interface RoomDocument {
  roomId: string
  state: Buffer
  updatedAt: Date
  room?: Room
}

export const RoomDocumentEntity = new EntitySchema<RoomDocument>({
  name: 'RoomDocument',
  tableName: 'room_documents',
  columns: {
    roomId: { type: 'char', length: 36, name: 'room_id', primary: true },
    state: { type: 'longblob' },
    updatedAt: { type: 'datetime', precision: 3, name: 'updated_at', updateDate: true },
  },
  relations: {
    room: { type: 'one-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
  },
})
