import { EntitySchema } from 'typeorm'
import type { Room } from './room.js'

/**
 * One accepted yjs update (V1) of a room document, stored before it is relayed to peers so that
 * whatever a peer has seen survives a crash. Compaction folds these rows into room_documents.state
 * and deletes them; on load they are applied in id order after the state.
 */
export interface RoomUpdate {
  id: string
  roomId: string
  update: Buffer
  /** The document version this update produced. */
  version: number
  createdAt: Date
  room?: Room
}

export const RoomUpdateEntity = new EntitySchema<RoomUpdate>({
  name: 'RoomUpdate',
  tableName: 'room_updates',
  columns: {
    // bigint comes back from mysql2 as a string: ids only grow, a room can see millions of edits
    id: { type: 'bigint', unsigned: true, primary: true, generated: 'increment' },
    roomId: { type: 'char', length: 36, name: 'room_id' },
    update: { type: 'longblob' },
    version: { type: 'int', unsigned: true },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
  indices: [{ name: 'idx_room_updates_room', columns: ['roomId', 'id'] }],
  relations: {
    room: { type: 'many-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
  },
})
