import { EntitySchema } from 'typeorm'
import type { Room } from './room.js'

/**
 * A site plan or photo laid under the frame, with its scale: pixels A and B are `distance` metres
 * apart, and pixel (originX, originY) sits at plan x = 0, y = 0.
 */
export interface RoomUnderlay {
  roomId: string
  image: Buffer
  mime: 'image/png' | 'image/jpeg'
  width: number
  height: number
  ax: number
  ay: number
  bx: number
  by: number
  distance: number
  originX: number
  originY: number
  updatedById: string | null
  updatedAt: Date
  room?: Room
}

const double = { type: 'double' } as const

export const RoomUnderlayEntity = new EntitySchema<RoomUnderlay>({
  name: 'RoomUnderlay',
  tableName: 'room_underlays',
  columns: {
    roomId: { type: 'char', length: 36, name: 'room_id', primary: true },
    image: { type: 'longblob' },
    mime: { type: 'varchar', length: 20 },
    width: { type: 'int', unsigned: true },
    height: { type: 'int', unsigned: true },
    ax: double,
    ay: double,
    bx: double,
    by: double,
    distance: double,
    originX: { ...double, name: 'origin_x' },
    originY: { ...double, name: 'origin_y' },
    updatedById: { type: 'char', length: 36, name: 'updated_by', nullable: true },
    updatedAt: { type: 'datetime', precision: 3, name: 'updated_at', updateDate: true },
  },
  relations: {
    room: { type: 'one-to-one', target: 'Room', joinColumn: { name: 'room_id' }, onDelete: 'CASCADE' },
  },
})
