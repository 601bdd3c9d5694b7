/**
 * Open rooms lists on the surface stream's socket.io server: a client sends `rooms:watch` and joins
 * its user's channel; `changed(roomId)` tells every member of the room (debounced per room) with
 * `rooms:changed`. Also counts the people who have a room open now (sockets that joined it).
 */
import type { DataSource } from 'typeorm'
import type { Realtime } from '../../realtime/index.js'

const userChannel = (userId: string): string => `user:${userId}`
const ROOM_CHANNEL = /^room:(.+)$/ // surface-stream.ts's channel()

export interface RoomsWatch {
  changed(roomId: string): void
  /** Distinct people with each room open, by room id. */
  peopleIn(roomIds: readonly string[]): Promise<Map<string, number>>
  close(): void
}

export function attachRoomsWatch(io: Realtime['io'], ds: DataSource, debounceMs = 300): RoomsWatch {
  const timers = new Map<string, NodeJS.Timeout>()

  const announce = async (roomId: string): Promise<void> => {
    const members: { user_id: string }[] = await ds.query('SELECT user_id FROM memberships WHERE room_id = ?', [roomId])
    if (members.length) io.to(members.map((m) => userChannel(m.user_id))).emit('rooms:changed', { roomId })
  }
  const changed = (roomId: string): void => {
    if (timers.has(roomId)) return
    const timer = setTimeout(() => {
      timers.delete(roomId)
      announce(roomId).catch(() => undefined) // a database hiccup only delays the next update
    }, debounceMs)
    timer.unref()
    timers.set(roomId, timer)
  }

  io.on('connection', (socket) => {
    socket.on('rooms:watch', () => void socket.join(userChannel(socket.data.user.id)))
  })
  // People coming and going change the "in the room now" count.
  const onPresence = (channel: string) => {
    const m = ROOM_CHANNEL.exec(channel)
    if (m?.[1]) changed(m[1])
  }
  io.of('/').adapter.on('join-room', onPresence)
  io.of('/').adapter.on('leave-room', onPresence)

  return {
    changed,
    async peopleIn(roomIds) {
      const out = new Map<string, number>()
      await Promise.all(
        roomIds.map(async (id) => {
          const sockets = await io.in(`room:${id}`).fetchSockets()
          out.set(id, new Set(sockets.map((s) => s.data.user.id)).size)
        }),
      )
      return out
    },
    close() {
      for (const t of timers.values()) clearTimeout(t)
      timers.clear()
      io.of('/').adapter.off('join-room', onPresence)
      io.of('/').adapter.off('leave-room', onPresence)
    },
  }
}
