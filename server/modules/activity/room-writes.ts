import { EventEmitter } from 'node:events'
import type { RequestHandler } from 'express'

const ROOM_PATH = /^\/rooms\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})(?:\/|$)/i

/** Emits `write` with the room id after every successful POST/PATCH/PUT/DELETE under /api/rooms/:id. */
export type RoomWrites = EventEmitter<{ write: [roomId: string] }>

export const roomWrites = (): RoomWrites => new EventEmitter<{ write: [roomId: string] }>()

/**
 * Mounted on the /api router before the feature routers: a snapshot saved, a member's role changed,
 * a room renamed reach the open rooms lists without each service knowing about them.
 */
export function announceRoomWrites(writes: RoomWrites): RequestHandler {
  return (req, res, next) => {
    const m = req.method === 'GET' || req.method === 'HEAD' ? null : ROOM_PATH.exec(req.path)
    if (m?.[1]) {
      const roomId = m[1].toLowerCase()
      res.on('finish', () => res.statusCode < 400 && writes.emit('write', roomId))
    }
    next()
  }
}
