/**
 * The rooms list's view of each room (server/modules/activity): GET /api/activity/rooms and
 * /api/activity/rooms/:id, and `rooms:watch` / `rooms:changed` on the surface stream's socket.
 */
import { io } from 'socket.io-client'
import { z } from 'zod'
import { solverReasonSchema } from '../../shared/protocol'
import { onServerEvent, type StreamSocket } from './socket'
import { request } from './http'

export const roomActivitySchema = z.object({
  lastChange: z.object({ at: z.string(), by: z.string().nullable(), what: z.string() }).nullable(),
  openPins: z.number().int().min(0),
  myOpenPins: z.number().int().min(0),
  solve: z.object({ state: z.enum(['settled', 'unsettled']), reason: solverReasonSchema.nullable() }).nullable(),
  people: z.number().int().min(0),
  thumbnail: z.string().startsWith('/api/').nullable(),
})
export type RoomActivity = z.infer<typeof roomActivitySchema>

export const listActivity = async (): Promise<Record<string, RoomActivity>> =>
  (
    await request(
      'GET',
      '/api/activity/rooms',
      undefined,
      z.object({ rooms: z.record(z.string(), roomActivitySchema) }),
    )
  ).rooms

export const roomActivity = async (roomId: string): Promise<RoomActivity> =>
  (
    await request(
      'GET',
      `/api/activity/rooms/${encodeURIComponent(roomId)}`,
      undefined,
      z.object({ activity: roomActivitySchema }),
    )
  ).activity

/** Calls `changed(roomId)` whenever a room I belong to changes; returns the stop function. */
export function watchRooms(changed: (roomId: string) => void): () => void {
  const socket: StreamSocket = io({ withCredentials: true })
  socket.on('connect', () => socket.emit('rooms:watch'))
  const off = onServerEvent(
    socket,
    'rooms:changed',
    (e) => changed(e.roomId),
    () => undefined,
  )
  return () => {
    off()
    socket.disconnect()
  }
}
