import type { LiveRoomPort } from '../../live-room-port/index.js'
import { AppError } from '../../lib/app-error.js'

/** What the team-work modules need from the live room (server/live-room-port). */
export type RoomLive = LiveRoomPort

/** A RoomLive whose implementation is attached once the realtime layer is up (after createApp). */
export interface LateRoomLive extends RoomLive {
  attach(impl: RoomLive): void
}

/**
 * Until attach() is called, reading frames and surfaces answers 503 'live_unavailable'; broadcasts
 * and socket closing are skipped (nobody can be connected without the realtime layer), and a new
 * room's starting frame is left to the blank one an empty document gets on first load.
 */
export function lateRoomLive(): LateRoomLive {
  let impl: RoomLive | null = null
  const unavailable = () =>
    new AppError('live_unavailable', 503, 'The live room service is not running, so the frame and surface cannot be read.')
  return {
    attach(next) {
      impl = next
    },
    getRoomFrame: (roomId) => (impl ? impl.getRoomFrame(roomId) : Promise.reject(unavailable())),
    getLatestSurface: (roomId) => (impl ? impl.getLatestSurface(roomId) : Promise.reject(unavailable())),
    emitToRoom: (roomId, event, payload) => impl?.emitToRoom(roomId, event, payload),
    closeRoomSockets: (roomId, userId) => impl?.closeRoomSockets(roomId, userId),
    // without a live room (team-work test servers) a new room keeps the blank frame an empty
    // document gets on its first load
    ensureRoomFrame: (roomId, starter) => impl?.ensureRoomFrame(roomId, starter) ?? Promise.resolve(false),
  }
}
