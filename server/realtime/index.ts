/**
 * The live room on one http server: the CRDT endpoint (/sync/<roomId>), the surface stream
 * (socket.io) and the solve loop with its worker pool, sharing one map of room documents.
 */
import type { AddressInfo } from 'node:net'
import type { Server } from 'node:http'
import type { RequestHandler } from 'express'
import type { DataSource } from 'typeorm'
import type { StarterKey } from '../../shared/room-doc/starters.js'
import type { Config } from '../config.js'
import { allowedOrigins } from './access.js'
import { RoomDocs, type RoomDocsOptions } from './room-docs.js'
import { readRoomFrame } from '../../shared/room-doc/read.js'
import { createSolveLoop, type SolveLoop } from './solve-loop.js'
import type { LiveRoomPort, RoomEmit } from '../live-room-port/index.js'
import { SolvePool } from './solve-pool.js'
import { attachSurfaceStream, createStreamServer, roomEmitter, type StreamServer } from './surface-stream.js'
import { attachSyncEndpoint } from './sync-endpoint.js'
import { createAdapter } from '@socket.io/redis-adapter'
import type { ScaleLink } from '../scale/index.js'
import { attachDocBus } from '../scale/doc-bus.js'
import { createClusterSolveLoop } from '../scale/solve-producer.js'

export interface RealtimeDeps {
  sessionMiddleware: RequestHandler
  /** passport's session middleware (req.user from the session). */
  passportSession: RequestHandler
  dataSource: DataSource
  config: Pick<Config, 'PUBLIC_URL' | 'NODE_ENV' | 'HOST'> & Partial<Pick<Config, 'SOLVE_WORKERS'>>
  /** Redis link when scale-out is on (REDIS_URL): rooms, events and solves are shared with other instances. */
  scale?: ScaleLink
  /** Overrides for tests and the benchmark. */
  tuning?: RoomDocsOptions & { workers?: number; staleMs?: number; coarseAbove?: number }
}

export type RoomEventListener = (roomId: string, event: string, payload: unknown) => void

/** The live room; as a LiveRoomPort it is what the HTTP modules receive. getLatestSurface solves on demand (up to 60 s). */
export interface Realtime extends LiveRoomPort {
  rooms: RoomDocs
  loop: SolveLoop
  /** The socket.io server of the surface stream (other modules add their own events to it). */
  io: StreamServer
  /** Calls `listener` with every event sent to a room (solve states, surfaces, pins); returns the unsubscribe. */
  onRoomEvent: (listener: RoomEventListener) => () => void
  /** Closes sockets, stops the workers and stores every loaded room. */
  close: () => Promise<void>
}

/**
 * Gives rooms their starting frames without a running server (scripts/migrate.ts --seed, the demo
 * seed): only rooms whose document is empty are written.
 */
export async function seedRoomFrames(dataSource: DataSource, frames: Record<string, StarterKey>): Promise<void> {
  const rooms = new RoomDocs(dataSource)
  try {
    for (const [roomId, key] of Object.entries(frames)) await rooms.ensureRoomFrame(roomId, key)
  } finally {
    await rooms.close()
  }
}

export function attachRealtime(httpServer: Server, deps: RealtimeDeps): Realtime {
  const { config, tuning = {} } = deps
  const access = {
    sessionMiddleware: deps.sessionMiddleware,
    passportSession: deps.passportSession,
    dataSource: deps.dataSource,
  }
  const base = allowedOrigins(config.PUBLIC_URL, config.NODE_ENV)
  // The address we actually listen on (port 0 in tests) is an allowed origin too.
  const origins = () => {
    const address = httpServer.address() as AddressInfo | null
    if (!address) return base
    const own = new Set(base)
    own.add(`http://${config.HOST}:${address.port}`)
    if (config.HOST === '127.0.0.1') own.add(`http://localhost:${address.port}`)
    return own
  }

  const { scale } = deps
  const rooms = new RoomDocs(deps.dataSource, { ...tuning, shared: scale !== undefined })
  // socket.io first, then the loop that emits through it, then the room handlers that read the loop.
  const adapter = scale ? createAdapter(scale.redis, scale.subscriber('socket.io')) : undefined
  const io = createStreamServer(httpServer, { access, origins, adapter })
  const toRoom = roomEmitter(io)
  // Every room event also goes to the listeners (the rooms list's activity).
  const listeners = new Set<RoomEventListener>()
  const emit: RoomEmit = (roomId, event, payload) => {
    toRoom(roomId, event, payload)
    for (const listener of listeners) listener(roomId, event, payload)
  }
  let pool: SolvePool | null = null
  let loop: SolveLoop
  // In scale-out, solves are BullMQ jobs for `npm run worker` processes (server/scale).
  const cluster = scale ? createClusterSolveLoop({ rooms, redis: scale.redis, emit }) : null
  if (cluster) loop = cluster
  else {
    pool = new SolvePool(tuning.workers ?? config.SOLVE_WORKERS ?? 2)
    // Booting a worker costs a few seconds of CPU (TypeScript loader + a warm-up solve): worth it for a
    // server, not for each of the many short-lived test servers, which start workers on first use.
    if (config.NODE_ENV !== 'test') pool.warmUp()
    loop = createSolveLoop({
      rooms,
      pool,
      emit,
      staleMs: tuning.staleMs,
      coarseAbove: tuning.coarseAbove,
    })
  }
  const stream = attachSurfaceStream(io, { rooms, access, latest: loop.latest })
  const sync = attachSyncEndpoint(httpServer, { rooms, access, origins })
  const closeLocal = (roomId?: string, userId?: string, deleted = false) => {
    if (deleted && roomId) rooms.discard(roomId)
    if (deleted) sync.closeWhere(roomId, userId, 4404, 'room deleted')
    else sync.closeWhere(roomId, userId)
    stream.closeWhere(roomId, userId)
  }
  const bus = scale
    ? attachDocBus({
        rooms,
        dataSource: deps.dataSource,
        pub: scale.redis,
        sub: scale.subscriber('rooms'),
        instanceId: scale.instanceId,
        closeLocal,
        onReconnect: () => cluster?.resubmitAll(),
      })
    : null

  return {
    rooms,
    loop,
    ensureRoomFrame: (roomId, starterKey) => rooms.ensureRoomFrame(roomId, starterKey),
    getRoomFrame: async (roomId) => {
      const room = await rooms.acquire(roomId)
      try {
        const read = readRoomFrame(room.doc)
        if (read.kind === 'invalid')
          return { frame: null, version: room.version, invalid: { path: read.path, message: read.message } }
        return { frame: read.kind === 'frame' ? read.frame : null, version: room.version }
      } finally {
        await rooms.release(room)
      }
    },
    getLatestSurface: async (roomId) => {
      const room = await rooms.acquire(roomId)
      try {
        return await loop.settledSurface(roomId, 60_000)
      } finally {
        await rooms.release(room)
      }
    },
    io,
    onRoomEvent: (listener) => {
      listeners.add(listener)
      return () => listeners.delete(listener)
    },
    emitToRoom: emit,
    closeRoomSockets: (roomId, userId) => (bus ? bus.closeWhere(roomId, userId) : closeLocal(roomId, userId)),
    // A deleted room is dropped on every instance, first, so edits still in flight on the closing
    // sockets are neither stored nor relayed.
    roomDeleted: (roomId) => (bus ? bus.closeWhere(roomId, undefined, true) : closeLocal(roomId, undefined, true)),
    close: async () => {
      // socket.io first: the sync endpoint's close then destroys every upgraded socket, both kinds.
      await stream.close()
      await sync.close()
      loop.close()
      bus?.close()
      await pool?.close()
      await rooms.close()
    },
  }
}
