import type { Figures, Frame, SolverReport } from '../../../shared/types.js'
import { AppError } from '../../lib/app-error.js'
import type { StarterKey } from '../../../shared/room-doc/starters.js'

/** The room's last settled (fine) surface, as the realtime layer keeps it. */
export interface LatestSurface {
  version: number
  /** #V×3, metres. */
  vertices: Float32Array
  /** #T×3 vertex indices. */
  triangles: Uint32Array
  figures: Figures
  solver: SolverReport
}

/**
 * What the team-work modules need from the live room (server/realtime/index.ts provides it; see
 * /work/notes/protocol.md "Server-side accessors"). Passed in, so these modules do not load sockets.
 */
export interface RoomLive {
  getRoomFrame(roomId: string): Promise<{ frame: Frame | null; version: number }>
  getLatestSurface(roomId: string): Promise<LatestSurface | null>
  emitToRoom(roomId: string, event: string, payload: unknown): void
  closeRoomSockets(roomId?: string, userId?: string): void
  /** Gives a new room's empty document a starting frame (optional: test doubles may leave it out). */
  ensureRoomFrame?(roomId: string, starter: StarterKey): Promise<boolean>
}

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
    ensureRoomFrame: (roomId, starter) => impl?.ensureRoomFrame?.(roomId, starter) ?? Promise.resolve(false),
  }
}
