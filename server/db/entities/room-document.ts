import { EntitySchema } from 'typeorm'
import type { Room } from './room.js'

/** The room's shared (yjs) document, stored as one merged V1 update. */
export interface RoomDocument {
  roomId: string
  state: Buffer
  /** Accepted updates so far (the live room's document version), counted by the server. */
  version: number
  updatedAt: Date
  room?: Room
}

export const RoomDocumentEntity = new EntitySchema<RoomDocument>({
  name: 'RoomDocument',
  tableName: 'room_documents',
  columns: {
    roomId: { type: 'char', length: 36, name: 'room_id', primary: true },
    state: { type: 'longblob' },
    version: { type: 'int', unsigned: true },
    updatedAt: { type: 'datetime', precision: 3, name: 'updated_at', updateDate: true },
  },
  relations: {
    room: { type: 'one-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
  },
})
