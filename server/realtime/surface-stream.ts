/**
 * The surface stream: socket.io on the same http server. The handshake runs the express-session
 * and passport middleware; `room:join` checks membership, joins `room:<id>` and holds the room's
 * document (so the room is solved while someone watches); the latest surface is sent on join.
 */
import type { Server as HttpServer } from 'node:http'
import { Server, type ServerOptions, type Socket } from 'socket.io'
import {
  can,
  roomRefSchema,
  type ClientToServerEvents,
  type JoinReply,
  type ServerToClientEvents,
  type SocketData,
} from '../../shared/protocol/index.js'
import { logger } from '../lib/logger.js'
import type { RoomEmit } from '../live-room-port/index.js'
import { roomRoleOf, sessionUser, type AccessDeps } from './access.js'
import type { LiveRoom, RoomDocs } from './room-docs.js'
import type { LatestEvent } from './solve-loop.js'

export type StreamServer = Server<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>
type StreamSocket = Socket<ClientToServerEvents, ServerToClientEvents, Record<string, never>, SocketData>

export interface SurfaceStreamOptions {
  rooms: RoomDocs
  access: AccessDeps
  /** The last surface (and solve state) of a room, sent to a client that joins. */
  latest: (roomId: string) => LatestEvent[] | Promise<LatestEvent[]>
}

export interface SurfaceStream {
  io: StreamServer
  /** Sends an event to everyone who joined the room. */
  emit: RoomEmit
  /** Disconnects the sockets of a room and/or a user (membership removed, signed out). */
  closeWhere: (roomId?: string, userId?: string) => void
  close: () => Promise<void>
}

export const channel = (roomId: string): string => `room:${roomId}`

/**
 * The socket.io server on the app's http server, admitting signed-in users only. Made before the
 * solve loop (which emits through it) and before its room handlers (which read the loop's latest).
 */
export function createStreamServer(
  httpServer: HttpServer,
  opts: {
    access: AccessDeps
    origins: () => Set<string>
    /** socket.io adapter factory (the Redis adapter in scale-out), so room events reach every instance. */
    adapter?: ServerOptions['adapter']
  },
): StreamServer {
  const io: StreamServer = new Server(httpServer, {
    // The /sync upgrade belongs to the CRDT endpoint; by default socket.io would destroy it after 1 s.
    destroyUpgrade: false,
    maxHttpBufferSize: 64 * 1024,
    serveClient: false,
    ...(opts.adapter ? { adapter: opts.adapter } : {}),
    // Same-origin polling requests carry no Origin header; a foreign Origin is refused.
    allowRequest: (req, callback) => {
      const origin = req.headers.origin
      callback(null, origin === undefined || opts.origins().has(origin))
    },
  })

  io.use((socket, next) => {
    sessionUser(socket.request, opts.access).then(
      (user) => {
        if (!user) return next(new Error('signed_out'))
        socket.data.user = user
        next()
      },
      (err: unknown) => next(err instanceof Error ? err : new Error(String(err))),
    )
  })
  return io
}

/** Sends a typed event to everyone who joined the room. */
export const roomEmitter =
  (io: StreamServer): RoomEmit =>
  (roomId, event, payload) => {
    io.to(channel(roomId)).emit(event, ...([payload] as Parameters<ServerToClientEvents[typeof event]>))
  }

/** The room handlers: `room:join` (membership checked, room held, latest sent) and `room:leave`. */
export function attachSurfaceStream(io: StreamServer, opts: SurfaceStreamOptions): SurfaceStream {
  io.on('connection', (socket: StreamSocket) => {
    const held = new Map<string, LiveRoom>()
    socket.on('error', (err) => logger.debug('realtime: socket.io error', { err: String(err) }))

    socket.on('room:join', async (body: unknown, ack?: unknown) => {
      // The event map types the arguments, but a client can send anything: parse them.
      const reply = typeof ack === 'function' ? (ack as (r: JoinReply) => void) : () => undefined
      try {
        const ref = roomRefSchema.safeParse(body)
        const roomId = ref.success ? ref.data.roomId : undefined
        const user = socket.data.user
        const role = roomId ? await roomRoleOf(opts.access.dataSource, roomId, user.id) : null
        if (!roomId || !role || !can(role, 'read')) {
          return reply({
            ok: false,
            error: { code: 'room_not_found', message: 'No such room, or you are not a member.' },
          })
        }
        if (!held.has(roomId)) {
          const room = await opts.rooms.acquire(roomId)
          if (socket.disconnected || held.has(roomId)) void opts.rooms.release(room)
          else held.set(roomId, room)
        }
        await socket.join(channel(roomId))
        reply({ ok: true, role })
        for (const latest of await opts.latest(roomId)) {
          if (latest.event === 'surface') socket.emit('surface', latest.payload)
          else if (latest.event === 'pattern') socket.emit('pattern', latest.payload)
          else socket.emit('solve:state', latest.payload)
        }
      } catch (err) {
        logger.error('realtime: room:join failed', { err: String(err) })
        reply({ ok: false, error: { code: 'internal', message: 'The room could not be opened.' } })
      }
    })

    socket.on('room:leave', async (body: unknown) => {
      const ref = roomRefSchema.safeParse(body)
      const roomId = ref.success ? ref.data.roomId : undefined
      const room = roomId ? held.get(roomId) : undefined
      if (!roomId || !room) return
      held.delete(roomId)
      await socket.leave(channel(roomId))
      await opts.rooms.release(room)
    })

    socket.on('disconnect', () => {
      for (const room of held.values()) void opts.rooms.release(room)
      held.clear()
    })
  })

  return {
    io,
    emit: roomEmitter(io),
    closeWhere: (roomId, userId) => {
      for (const socket of io.sockets.sockets.values()) {
        const inRoom = roomId === undefined || socket.rooms.has(channel(roomId))
        const isUser = userId === undefined || (socket.data.user as SocketData['user'] | undefined)?.id === userId
        if (inRoom && isUser) socket.disconnect(true)
      }
    },
    close: async () => {
      io.disconnectSockets(true)
      // io.close() would also close the http server, which belongs to the caller.
      io.engine.close()
    },
  }
}
