/**
 * The CRDT endpoint: y-websocket's protocol (y-protocols sync + awareness) at /sync/<roomId>.
 * Everything is checked in the HTTP upgrade, before the socket is accepted: Origin, session user,
 * room membership, and the room document is loaded so nobody syncs against an empty doc.
 * Reviewers and viewers are read only: their sync-step-2 and update messages are dropped.
 */
import type { IncomingMessage, Server } from 'node:http'
import type { Duplex } from 'node:stream'
import * as decoding from 'lib0/decoding'
import * as encoding from 'lib0/encoding'
import * as awarenessProtocol from 'y-protocols/awareness'
import * as syncProtocol from 'y-protocols/sync'
import { WebSocketServer, type WebSocket } from 'ws'
import * as Y from 'yjs'
import { logger } from '../lib/logger.js'
import { decodePathSegment } from '../lib/url-path.js'
import { can } from '../../shared/protocol/index.js'
import { parseRoomId, roomRoleOf, sessionUser, type AccessDeps } from './access.js'
import type { LiveRoom, RoomDocs } from './room-docs.js'

const MESSAGE_SYNC = 0
const MESSAGE_AWARENESS = 1
const MESSAGE_QUERY_AWARENESS = 3
const PATH_PREFIX = '/sync/'

export interface SyncEndpointOptions {
  rooms: RoomDocs
  access: AccessDeps
  /** Origins allowed to open the socket (checked on every upgrade, so it may change). */
  origins: () => Set<string>
  /** Largest message accepted, bytes (ws closes the socket beyond it). */
  maxPayload?: number
  pingMs?: number
}

export interface SyncEndpoint {
  /** Open connections, for tests and the benchmark. */
  connections: () => number
  /**
   * Revokes the sockets of a room and/or a user (membership removed or changed, signed out, room
   * deleted); both optional. From this call on their messages are dropped and nothing more is
   * sent to them; the socket is told why (`code`, default 4403) and then terminated.
   */
  closeWhere: (roomId?: string, userId?: string, code?: number, reason?: string) => void
  close: () => Promise<void>
}

/** Sockets whose access was withdrawn: their messages are dropped while the close goes out. */
const revoked = new WeakSet<WebSocket>()
/** How long a revoked socket has to receive its close frame before it is cut. */
const REVOKE_GRACE_MS = 100

function revoke(ws: WebSocket, code: number, reason: string): void {
  if (revoked.has(ws)) return
  revoked.add(ws)
  // close() alone would wait up to 30 s for the peer's reply; the peer does not get to decide.
  ws.close(code, reason)
  setTimeout(() => ws.terminate(), REVOKE_GRACE_MS).unref()
}

function refuse(socket: Duplex, status: number, reason: string): void {
  socket.end(
    `HTTP/1.1 ${status} ${reason}\r\nConnection: close\r\nContent-Type: text/plain\r\nContent-Length: ${reason.length}\r\n\r\n${reason}`,
  )
  socket.destroy()
}

/** Attaches the endpoint to the server's 'upgrade' event; other paths are left to socket.io. */
export function attachSyncEndpoint(server: Server, opts: SyncEndpointOptions): SyncEndpoint {
  const wss = new WebSocketServer({ noServer: true, maxPayload: opts.maxPayload ?? 2 * 1024 * 1024 })
  const live = new Map<WebSocket, { roomId: string; userId: string }>()
  const alive = new WeakSet<WebSocket>()
  let closing = false

  const accept = async (req: IncomingMessage, socket: Duplex, head: Buffer): Promise<void> => {
    const origin = req.headers.origin
    if (!origin || !opts.origins().has(origin)) return refuse(socket, 403, 'Forbidden')
    const path = new URL(req.url ?? '/', 'http://localhost').pathname
    const segment = decodePathSegment(path.slice(PATH_PREFIX.length))
    if (segment === null) return refuse(socket, 400, 'Bad Request: malformed percent-encoding in the room id')
    const roomId = parseRoomId(segment)
    if (!roomId) return refuse(socket, 404, 'Not Found')
    const user = await sessionUser(req, opts.access)
    if (!user) return refuse(socket, 401, 'Unauthorized')
    const role = await roomRoleOf(opts.access.dataSource, roomId, user.id)
    if (!role) return refuse(socket, 404, 'Not Found')
    if (closing) return refuse(socket, 503, 'Service Unavailable')
    const room = await opts.rooms.acquire(roomId)
    // The checks above wait for the database: the socket may have gone, or the server be closing.
    if (socket.destroyed || closing) {
      void opts.rooms.release(room)
      return closing ? refuse(socket, 503, 'Service Unavailable') : undefined
    }
    wss.handleUpgrade(req, socket, head, (ws) => {
      live.set(ws, { roomId, userId: user.id })
      alive.add(ws)
      ws.on('pong', () => alive.add(ws))
      serve(ws, room, !can(role, 'editFrame'), user.id)
      ws.once('close', () => {
        live.delete(ws)
        void opts.rooms.release(room)
      })
    })
  }

  // Upgraded sockets leave the http server's connection list (closeAllConnections misses them) yet
  // keep server.close() waiting: every one is tracked here, of any path, and destroyed on close.
  const upgraded = new Set<Duplex>()
  const onUpgrade = (req: IncomingMessage, socket: Duplex, head: Buffer): void => {
    if (closing) return void socket.destroy()
    upgraded.add(socket)
    socket.once('close', () => upgraded.delete(socket))
    if (!(req.url ?? '').startsWith(PATH_PREFIX)) return
    socket.on('error', (err) => logger.debug('realtime: upgrade socket error', { err: String(err) }))
    accept(req, socket, head).catch((err: unknown) => {
      logger.error('realtime: sync upgrade failed', { err: String(err) })
      if (!socket.destroyed) refuse(socket, 500, 'Internal Server Error')
    })
  }
  server.on('upgrade', onUpgrade)

  // Sockets that did not answer the last ping are dropped, so a vanished laptop frees its room.
  const pingMs = opts.pingMs ?? 30_000
  const pinger = setInterval(() => {
    for (const ws of live.keys()) {
      if (!alive.has(ws)) {
        ws.terminate()
        continue
      }
      alive.delete(ws)
      ws.ping()
    }
  }, pingMs)
  pinger.unref()

  return {
    connections: () => live.size,
    closeWhere: (roomId, userId, code = 4403, reason = 'access changed') => {
      for (const [ws, who] of live) {
        if ((roomId === undefined || who.roomId === roomId) && (userId === undefined || who.userId === userId))
          revoke(ws, code, reason)
      }
    },
    close: async () => {
      // The upgrade handler stays attached so that late upgrades (reconnecting clients) are refused.
      closing = true
      clearInterval(pinger)
      for (const ws of live.keys()) ws.terminate()
      // wss.close() waits for every tracked client; none may be left open.
      for (const ws of wss.clients) ws.terminate()
      await new Promise<void>((resolve) => wss.close(() => resolve()))
      for (const socket of upgraded) socket.destroy()
    },
  }
}

function send(ws: WebSocket, message: Uint8Array): void {
  if (ws.readyState === ws.OPEN) ws.send(message, (err) => err && ws.terminate())
}

/** Speaks the y-websocket protocol on one accepted socket. */
function serve(ws: WebSocket, room: LiveRoom, readOnly: boolean, userId: string): void {
  const controlled = new Set<number>()
  room.editors.set(ws, userId)
  ws.on('error', (err) => logger.debug('realtime: sync socket error', { roomId: room.roomId, err: String(err) }))

  const relay = (update: Uint8Array, origin: unknown) => {
    if (origin === ws || revoked.has(ws)) return
    const encoder = encoding.createEncoder()
    encoding.writeVarUint(encoder, MESSAGE_SYNC)
    syncProtocol.writeUpdate(encoder, update)
    send(ws, encoding.toUint8Array(encoder))
  }
  room.relays.add(relay)

  const onAwareness = (changes: { added: number[]; updated: number[]; removed: number[] }, origin: unknown) => {
    const changed = [...changes.added, ...changes.updated, ...changes.removed]
    if (origin === ws) {
      for (const id of [...changes.added, ...changes.updated]) controlled.add(id)
      for (const id of changes.removed) controlled.delete(id)
    }
    if (revoked.has(ws)) return
    send(ws, awarenessMessage(room, changed))
  }
  room.awareness.on('update', onAwareness)

  ws.on('message', (data, isBinary) => {
    if (revoked.has(ws)) return
    try {
      if (!isBinary) throw new Error('text frame')
      handleMessage(ws, room, readOnly, userId, toBytes(data))
    } catch (err) {
      // A message that does not decode is either a bug or an attack: end this socket only.
      logger.warn('realtime: closing a sync socket on a bad message', { roomId: room.roomId, err: String(err) })
      ws.close(4400, 'bad message')
      ws.terminate()
    }
  })

  ws.once('close', () => {
    room.relays.delete(relay)
    room.awareness.off('update', onAwareness)
    awarenessProtocol.removeAwarenessStates(room.awareness, [...controlled], null)
    for (const [id, owner] of room.presenceOwners) if (owner.socket === ws) room.presenceOwners.delete(id)
  })

  // The server opens with its own sync-step-1 so the client sends what the server lacks.
  const encoder = encoding.createEncoder()
  encoding.writeVarUint(encoder, MESSAGE_SYNC)
  syncProtocol.writeSyncStep1(encoder, room.doc)
  send(ws, encoding.toUint8Array(encoder))
  if (room.awareness.getStates().size > 0) send(ws, awarenessMessage(room, [...room.awareness.getStates().keys()]))
}

/** An awareness update's entries (y-protocols layout: count, then per client id, clock, JSON state). */
function awarenessEntries(update: Uint8Array): { id: number; clock: number; state: string }[] {
  const decoder = decoding.createDecoder(update)
  const count = decoding.readVarUint(decoder)
  const entries: { id: number; clock: number; state: string }[] = []
  for (let i = 0; i < count; i++) {
    entries.push({
      id: decoding.readVarUint(decoder),
      clock: decoding.readVarUint(decoder),
      state: decoding.readVarString(decoder),
    })
  }
  return entries
}

function encodeAwarenessEntries(entries: { id: number; clock: number; state: string }[]): Uint8Array {
  const encoder = encoding.createEncoder()
  encoding.writeVarUint(encoder, entries.length)
  for (const e of entries) {
    encoding.writeVarUint(encoder, e.id)
    encoding.writeVarUint(encoder, e.clock)
    encoding.writeVarString(encoder, e.state)
  }
  return encoding.toUint8Array(encoder)
}

/**
 * Whether bytes can be a V1 update. A V2 update always starts with its feature flag, 0; a V1 update
 * starts with its count of clients with structs, so a V1 one starting with 0 carries only a delete
 * set (count, then per client: id, count, then clock/length pairs) that must end exactly at the end.
 */
export function isV1Update(update: Uint8Array): boolean {
  if (update.length === 0) return false
  if (update[0] !== 0) return true
  try {
    const d = decoding.createDecoder(update)
    decoding.readVarUint(d)
    const clients = decoding.readVarUint(d)
    for (let i = 0; i < clients; i++) {
      decoding.readVarUint(d)
      const ranges = decoding.readVarUint(d)
      for (let j = 0; j < ranges; j++) {
        decoding.readVarUint(d)
        decoding.readVarUint(d)
      }
    }
    return !decoding.hasContent(d)
  } catch {
    return false
  }
}

function toBytes(data: Buffer | ArrayBuffer | Buffer[]): Uint8Array {
  if (Array.isArray(data)) return new Uint8Array(Buffer.concat(data))
  return data instanceof ArrayBuffer
    ? new Uint8Array(data)
    : new Uint8Array(data.buffer, data.byteOffset, data.byteLength)
}

function awarenessMessage(room: LiveRoom, clients: number[]): Uint8Array {
  const encoder = encoding.createEncoder()
  encoding.writeVarUint(encoder, MESSAGE_AWARENESS)
  encoding.writeVarUint8Array(encoder, awarenessProtocol.encodeAwarenessUpdate(room.awareness, clients))
  return encoding.toUint8Array(encoder)
}

function handleMessage(ws: WebSocket, room: LiveRoom, readOnly: boolean, userId: string, bytes: Uint8Array): void {
  const decoder = decoding.createDecoder(bytes)
  const type = decoding.readVarUint(decoder)
  if (type === MESSAGE_SYNC) {
    const step = decoding.readVarUint(decoder)
    if (step === syncProtocol.messageYjsSyncStep1) {
      const stateVector = decoding.readVarUint8Array(decoder)
      Y.decodeStateVector(stateVector)
      // Answered after the updates queued so far are stored: a joiner sees only durable state.
      void room.chain.then(() => {
        const encoder = encoding.createEncoder()
        encoding.writeVarUint(encoder, MESSAGE_SYNC)
        syncProtocol.writeSyncStep2(encoder, room.doc, stateVector)
        send(ws, encoding.toUint8Array(encoder))
      })
    } else if (step === syncProtocol.messageYjsSyncStep2 || step === syncProtocol.messageYjsUpdate) {
      const update = decoding.readVarUint8Array(decoder)
      if (!isV1Update(update)) throw new Error('not a V1 update (V2 and other formats are refused)')
      if (!readOnly) room.applyClientUpdate(update, ws)
    } else {
      throw new Error(`unknown sync step ${step}`)
    }
  } else if (type === MESSAGE_AWARENESS) {
    const update = decoding.readVarUint8Array(decoder)
    // A user may speak only for client ids they introduced: no faking or removing others' presence.
    // The same user may take an id over (a reconnect while the old socket is not yet closed).
    // Entries for another user's client are dropped, not punished: y-websocket clients rebroadcast
    // the removal of a peer whose presence timed out, which a loaded room sees all the time.
    const own = awarenessEntries(update).filter((e) => {
      const owner = room.presenceOwners.get(e.id)
      return owner === undefined || owner.userId === userId
    })
    if (own.length === 0) return
    for (const e of own) room.presenceOwners.set(e.id, { socket: ws, userId })
    awarenessProtocol.applyAwarenessUpdate(room.awareness, encodeAwarenessEntries(own), ws)
  } else if (type === MESSAGE_QUERY_AWARENESS) {
    send(ws, awarenessMessage(room, [...room.awareness.getStates().keys()]))
  } else {
    throw new Error(`unknown message type ${type}`)
  }
}
