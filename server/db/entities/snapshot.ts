import { EntitySchema } from 'typeorm'
import type { Room } from './room.js'
import type { User } from './user.js'

/** A named, saved copy of frame + surface + figures. surface holds the binary mesh. */
export interface Snapshot {
  id: string
  roomId: string
  name: string
  note: string
  authorId: string | null
  frame: unknown
  surface: Buffer
  figures: unknown
  /** The flat patterns (PatternResult) of the surface when the room had seams, else null. */
  pattern: unknown
  createdAt: Date
  room?: Room
  author?: User | null
}

export const SnapshotEntity = new EntitySchema<Snapshot>({
  name: 'Snapshot',
  tableName: 'snapshots',
  columns: {
    id: { type: 'char', length: 36, primary: true },
    roomId: { type: 'char', length: 36, name: 'room_id' },
    name: { type: 'varchar', length: 120 },
    note: { type: 'text' },
    // A snapshot outlives its author's account: the author link is cleared, not the snapshot.
    authorId: { type: 'char', length: 36, name: 'author_id', nullable: true },
    frame: { type: 'json' },
    surface: { type: 'longblob' },
    figures: { type: 'json' },
    pattern: { type: 'json', nullable: true },
    createdAt: { type: 'datetime', precision: 3, name: 'created_at', createDate: true },
  },
  relations: {
    room: { type: 'many-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
    author: {
      type: 'many-to-one',
      target: 'User',
      joinColumn: { name: 'author_id' },
      onDelete: 'SET NULL',
      nullable: true,
    },
  },
})
