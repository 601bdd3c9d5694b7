/**
 * The surface stream (socket.io; event maps and payload schemas in shared/protocol/events.ts):
 * join a room, receive solved surfaces, solver states, progress and pin changes. Every payload is
 * parsed at this edge (binary fields arrive as ArrayBuffer and leave as typed arrays), so the rest
 * of the client only sees well-formed messages.
 */
import { io, type Socket } from 'socket.io-client'
import {
  joinReplySchema,
  parseServerEvent,
  type ClientToServerEvents,
  type JoinReply,
  type PatternEvent,
  type ServerEvent,
  type ServerPayload,
  type ServerToClientEvents,
  type SolveProgressEvent,
  type SolveStateEvent,
  type SurfaceEvent,
} from '../../shared/protocol'

export type StreamSocket = Socket<ServerToClientEvents, ClientToServerEvents>

export interface StreamHandlers {
  surface(msg: SurfaceEvent): void
  solveState(msg: SolveStateEvent): void
  /** The room's flat patterns after a settle, or why there are none. */
  pattern(msg: PatternEvent): void
  solveProgress(msg: SolveProgressEvent): void
  /** Connection changes and messages that could not be read. */
  status(connected: boolean, error?: string): void
}

/** Listens to one server event on `socket`, parsed; a payload that does not parse goes to `bad`. */
export function onServerEvent<E extends ServerEvent>(
  socket: StreamSocket,
  event: E,
  use: (msg: ServerPayload<E>) => void,
  bad: (message: string) => void,
): () => void {
  const listener = (raw: unknown): void => {
    let msg: ServerPayload<E>
    try {
      msg = parseServerEvent(event, raw)
    } catch (err) {
      return bad(err instanceof Error ? err.message : String(err))
    }
    use(msg)
  }
  // socket.io's map types the listener by the server's payload; ours takes raw input and parses it.
  const untyped = socket as unknown as {
    on(e: string, l: (raw: unknown) => void): void
    off(e: string, l: (raw: unknown) => void): void
  }
  untyped.on(event, listener)
  return () => void untyped.off(event, listener)
}

function readJoin(reply: unknown): JoinReply {
  const r = joinReplySchema.safeParse(reply)
  if (r.success) return r.data
  return { ok: false, error: { code: 'join_failed', message: 'The room could not be joined.' } }
}

export interface SurfaceStream {
  socket: StreamSocket
  join(roomId: string): Promise<JoinReply>
  leave(roomId: string): void
  close(): void
}

/** Connects to the surface stream (same origin, session cookie) and routes messages to handlers. */
export function connectSurfaceStream(handlers: StreamHandlers): SurfaceStream {
  const socket: StreamSocket = io({ withCredentials: true })
  const bad = (message: string): void => handlers.status(socket.connected, message)
  socket.on('connect', () => handlers.status(true))
  socket.on('disconnect', () => handlers.status(false))
  socket.on('connect_error', (err) => handlers.status(false, err.message))
  onServerEvent(socket, 'surface', handlers.surface, bad)
  onServerEvent(socket, 'solve:state', handlers.solveState, bad)
  onServerEvent(socket, 'solve:progress', handlers.solveProgress, bad)
  onServerEvent(socket, 'pattern', handlers.pattern, bad)
  return {
    socket,
    join: (roomId) =>
      socket
        .timeout(10_000)
        .emitWithAck('room:join', { roomId })
        .then(readJoin, () => ({
          ok: false as const,
          error: { code: 'timeout', message: 'The server did not answer the room join in 10 s.' },
        })),
    leave: (roomId) => {
      socket.emit('room:leave', { roomId })
    },
    close: () => {
      socket.removeAllListeners()
      socket.disconnect()
    },
  }
}
