/**
 * socket.io's typed event maps for the surface stream (server/realtime/surface-stream.ts,
 * src/api/socket.ts): `Server<ClientToServerEvents, ServerToClientEvents, {}, SocketData>` on the
 * server, `Socket<ServerToClientEvents, ClientToServerEvents>` on the client. Each event has a zod
 * schema so the receiving side parses what it gets instead of trusting the map.
 */
import { z } from 'zod'
import { patternEventSchema, type PatternEvent } from './pattern'
import { pinChangedEventSchema, pinDeletedEventSchema, type PinChangedEvent, type PinDeletedEvent } from './pins'
import { roomRoleSchema, type RoomRole } from './roles'
import {
  solveProgressEventSchema,
  solveStateEventSchema,
  surfaceEventSchema,
  type SolveProgressEvent,
  type SolveStateEvent,
  type SurfaceEvent,
} from './surface'

const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

/** A room id as the API hands them out (UUID), lower-cased. */
export const roomIdSchema = z
  .string()
  .regex(uuid, 'must be a room id (UUID)')
  .transform((s) => s.toLowerCase())

/** Body of `room:join` and `room:leave`. */
export const roomRefSchema = z.object({ roomId: roomIdSchema })
export type RoomRef = z.input<typeof roomRefSchema>

/** Reply to `room:join`: the member's role, or why not. */
export const joinReplySchema = z.union([
  z.object({ ok: z.literal(true), role: roomRoleSchema }),
  z.object({ ok: z.literal(false), error: z.object({ code: z.string(), message: z.string() }) }),
])
export type JoinReply = { ok: true; role: RoomRole } | { ok: false; error: { code: string; message: string } }

/** `rooms:changed`: something in a room I belong to changed; the rooms list fetches that room again. */
export const roomsChangedEventSchema = z.object({ roomId: roomIdSchema })
export type RoomsChangedEvent = z.output<typeof roomsChangedEventSchema>

export interface ClientToServerEvents {
  /** The rooms list is open: send me `rooms:changed` for every room I belong to. */
  'rooms:watch': () => void
  /** Join a room's broadcasts; the latest surface and solve state follow the reply. */
  'room:join': (body: RoomRef, ack: (reply: JoinReply) => void) => void
  'room:leave': (body: RoomRef) => void
}

export interface ServerToClientEvents {
  surface: (e: SurfaceEvent) => void
  'solve:state': (e: SolveStateEvent) => void
  'solve:progress': (e: SolveProgressEvent) => void
  /** The room's flat patterns after a settle, or why there are none. */
  pattern: (e: PatternEvent) => void
  'pin:changed': (e: PinChangedEvent) => void
  'pin:deleted': (e: PinDeletedEvent) => void
  'rooms:changed': (e: RoomsChangedEvent) => void
}

export type ServerEvent = keyof ServerToClientEvents
/** The payload of a server→client event. */
export type ServerPayload<E extends ServerEvent> = Parameters<ServerToClientEvents[E]>[0]

/** What the server keeps on each socket.io socket (set by the handshake middleware). */
export interface SocketData {
  user: { id: string; name: string }
}

/** One schema per server→client event, for the client's edge. */
export const serverEventSchemas: { [E in ServerEvent]: z.ZodType<ServerPayload<E>> } = {
  surface: surfaceEventSchema,
  'solve:state': solveStateEventSchema,
  'solve:progress': solveProgressEventSchema,
  pattern: patternEventSchema,
  'pin:changed': pinChangedEventSchema,
  'pin:deleted': pinDeletedEventSchema,
  'rooms:changed': roomsChangedEventSchema,
}

/**
 * Parses one server→client event's payload; throws an Error whose message names the event and the
 * field ("surface.triangles: vertex index 9 is out of range (3 vertices)").
 */
export function parseServerEvent<E extends ServerEvent>(event: E, raw: unknown): ServerPayload<E> {
  const r = serverEventSchemas[event].safeParse(raw)
  if (r.success) return r.data
  const issue = r.error.issues[0]
  const path = [event, ...(issue?.path ?? []).map(String)].join('.')
  throw new Error(`${path}: ${issue?.message ?? 'invalid'}`)
}
