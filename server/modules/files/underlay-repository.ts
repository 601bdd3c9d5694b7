import type { DataSource } from 'typeorm'
import { RoomUnderlayEntity, type RoomUnderlay } from '../../db/entities/room-underlay.js'

const metaColumns = {
  roomId: true,
  mime: true,
  width: true,
  height: true,
  ax: true,
  ay: true,
  bx: true,
  by: true,
  distance: true,
  originX: true,
  originY: true,
  updatedAt: true,
} as const

/** One underlay per room; the image bytes are read only when the image itself is asked for. */
export function underlayRepository(dataSource: DataSource) {
  const repo = dataSource.getRepository(RoomUnderlayEntity)
  return {
    save: (u: Omit<RoomUnderlay, 'updatedAt'>) => repo.upsert(u, ['roomId']),
    meta: (roomId: string) => repo.findOne({ where: { roomId }, select: metaColumns }),
    image: (roomId: string) =>
      repo.findOne({ where: { roomId }, select: { roomId: true, mime: true, image: true, updatedAt: true } }),
    delete: (roomId: string) => repo.delete({ roomId }),
  }
}
