/**
 * What the HTTP modules (rooms, pins, snapshots, files, invites) may ask of the live room, as one
 * small interface: the realtime layer (server/realtime/index.ts) implements it and is built before
 * the routes, which receive it as a plain argument. Event names and payloads are the shared
 * protocol's (shared/protocol/events.ts).
 */
import type { StarterKey } from '../../shared/room-doc/starters.js'
import type { ServerEvent, ServerPayload, SettledSurface } from '../../shared/protocol/index.js'
import type { Frame } from '../../shared/types.js'
import { AppError } from '../lib/app-error.js'

/** Sends a typed event to everyone who joined the room. */
export type RoomEmit = <E extends ServerEvent>(roomId: string, event: E, payload: ServerPayload<E>) => void

export interface LiveRoomPort {
  /**
   * The room's current frame and version. `frame` is null when the document is empty or invalid;
   * `invalid` then names the path (`loops[0].points[2]`) and the reason (shared/room-doc/read.ts).
   */
  getRoomFrame(
    roomId: string,
  ): Promise<{ frame: Frame | null; version: number; invalid?: { path: string; message: string } }>
  /** The room's last settled fine surface (solved on demand when the room was not loaded). */
  getLatestSurface(roomId: string): Promise<SettledSurface | null>
  emitToRoom: RoomEmit
  /** Closes the live sockets (sync and surface stream) of a room and/or a user. */
  closeRoomSockets(roomId?: string, userId?: string): void
  /** A room was deleted: its sockets are closed (code 4404) and its live document dropped unstored. */
  roomDeleted(roomId: string): void
  /** Gives a new room's empty document a starting frame; false when it already had one. */
  ensureRoomFrame(roomId: string, starter: StarterKey): Promise<boolean>
}

/**
 * The port of an app with no live room (createApp alone, as in app tests): reading frames and
 * surfaces answers 503 'live_unavailable'; broadcasts and socket closing do nothing (nobody can be
 * connected), and a new room keeps the blank frame an empty document gets on its first load.
 */
export function offlineLiveRoom(): LiveRoomPort {
  const unavailable = () =>
    new AppError(
      'live_unavailable',
      503,
      'The live room service is not running, so the frame and surface cannot be read.',
    )
  return {
    getRoomFrame: () => Promise.reject(unavailable()),
    getLatestSurface: () => Promise.reject(unavailable()),
    emitToRoom: () => undefined,
    closeRoomSockets: () => undefined,
    roomDeleted: () => undefined,
    ensureRoomFrame: () => Promise.resolve(false),
  }
}
