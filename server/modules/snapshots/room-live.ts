import type { Figures, Frame, SolverReport } from '../../../shared/types.js'

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
}
