/**
 * The surface stream (socket.io, notes/protocol.md "Surface stream"): join a room, receive solved
 * surfaces, solver states and progress. Binary fields arrive as ArrayBuffer (browser) or Buffer
 * (Node) and are wrapped back into typed arrays here, checked, so the rest of the client only ever
 * sees well-formed Float32Array / Uint32Array data.
 */
import { io, type Socket } from 'socket.io-client'
import { z } from 'zod'
import type { Figures, SolverReport, SolverState } from '../../shared/types'
import type { RoomRole } from './schemas'
import { roomRoles } from './schemas'

export interface SurfaceMessage {
  roomId: string
  version: number
  /** Y.encodeStateVector of the document the surface was solved from. */
  stateVector: Uint8Array
  /** True for a quick preview on a coarser mesh while the full solve runs. */
  coarse: boolean
  /** #V×3, metres. */
  vertices: Float32Array
  /** #T×3 vertex indices. */
  triangles: Uint32Array
  figures: Figures
  solver: SolverReport
}

export interface SolveStateMessage {
  roomId: string
  version: number
  state: SolverState
  reason?: string
  message?: string
  field?: string
}

export interface SolveProgressMessage {
  roomId: string
  version: number
  iteration: number
  residual: number
}

export interface StreamHandlers {
  surface(msg: SurfaceMessage): void
  solveState(msg: SolveStateMessage): void
  solveProgress(msg: SolveProgressMessage): void
  /** Connection changes and messages that could not be read. */
  status(connected: boolean, error?: string): void
}

type TypedCtor<T> = { new (buffer: ArrayBufferLike, byteOffset: number, length: number): T; BYTES_PER_ELEMENT: number }

function wrap<T>(value: unknown, Ctor: TypedCtor<T>, field: string): T {
  let buffer: ArrayBufferLike
  let offset = 0
  let bytes: number
  if (value instanceof ArrayBuffer) {
    buffer = value
    bytes = value.byteLength
  } else if (ArrayBuffer.isView(value)) {
    buffer = value.buffer
    offset = value.byteOffset
    bytes = value.byteLength
  } else {
    throw new Error(`surface.${field}: expected binary data, got ${value === null ? 'null' : typeof value}`)
  }
  const size = Ctor.BYTES_PER_ELEMENT
  if (bytes % size !== 0)
    throw new Error(`surface.${field}: ${bytes} bytes is not a whole number of ${size}-byte values`)
  // A view into a pooled Node Buffer may start at an unaligned offset; copy it out then.
  if (offset % size !== 0) {
    buffer = new Uint8Array(buffer, offset, bytes).slice().buffer
    offset = 0
  }
  return new Ctor(buffer, offset, bytes / size)
}

/** Float32Array from an ArrayBuffer, Buffer or typed array (field names the message field). */
export const asFloat32 = (value: unknown, field: string): Float32Array => wrap(value, Float32Array, field)
/** Uint32Array from an ArrayBuffer, Buffer or typed array. */
export const asUint32 = (value: unknown, field: string): Uint32Array => wrap(value, Uint32Array, field)
/** Uint8Array from an ArrayBuffer, Buffer or typed array. */
export const asUint8 = (value: unknown, field: string): Uint8Array => wrap(value, Uint8Array, field)

const num = z.number()
const range = z.tuple([num, num])
// Checked at the edge so a drift in the engine's figures shows as one message naming the field,
// not as a blank panel.
const figuresSchema = z.object({
  area: num,
  planArea: num,
  perimeter: num,
  cables: z.array(z.object({ loop: z.number().int(), edge: z.number().int(), length: num, force: num, sag: num })),
  heightRange: range,
  slopeRange: range,
  slopeHistogram: z.object({ edges: z.array(num), shares: z.array(num) }),
  flatThreshold: num,
  flatShare: num,
  pondingPockets: z.array(z.object({ x: num, y: num, z: num, area: num })),
  anticlasticShare: num,
  reactions: z.array(z.tuple([num, num, num, num, num])),
  residual: num,
  minAngle: num,
})
const solverSchema = z.object({
  method: z.string(),
  iterations: num,
  residual: num,
  converged: z.boolean(),
  reason: z.string().optional(),
  ms: num,
})

function parse<T>(schema: z.ZodType<T>, value: unknown, field: string): T {
  const r = schema.safeParse(value)
  if (r.success) return r.data
  const issue = r.error.issues[0]
  const path = [field, ...(issue?.path ?? []).map(String)].join('.')
  throw new Error(`${path}: ${issue?.message ?? 'invalid'}`)
}

/** Reads a `surface` message; throws an Error naming the field for anything malformed. */
export function readSurface(raw: unknown): SurfaceMessage {
  if (typeof raw !== 'object' || raw === null) throw new Error('surface: expected an object')
  const m = raw as Record<string, unknown>
  if (typeof m.roomId !== 'string') throw new Error('surface.roomId: expected a string')
  if (typeof m.version !== 'number') throw new Error('surface.version: expected a number')
  const vertices = asFloat32(m.vertices, 'vertices')
  const triangles = asUint32(m.triangles, 'triangles')
  if (vertices.length % 3 !== 0) throw new Error('surface.vertices: length is not a multiple of 3')
  if (triangles.length % 3 !== 0) throw new Error('surface.triangles: length is not a multiple of 3')
  const count = vertices.length / 3
  for (const index of triangles) {
    if (index >= count) throw new Error(`surface.triangles: vertex index ${index} is out of range (${count} vertices)`)
  }
  return {
    roomId: m.roomId,
    version: m.version,
    stateVector: asUint8(m.stateVector, 'stateVector'),
    coarse: m.coarse === true,
    vertices,
    triangles,
    figures: parse(figuresSchema, m.figures, 'surface.figures'),
    solver: parse(solverSchema, m.solver, 'surface.solver'),
  }
}

const SOLVER_STATES: readonly SolverState[] = ['settling', 'settled', 'unsettled']
const optString = (v: unknown): string | undefined => (typeof v === 'string' ? v : undefined)

/** Reads a `solve:state` message. */
export function readSolveState(raw: unknown): SolveStateMessage {
  const m = (raw ?? {}) as Record<string, unknown>
  if (typeof m.roomId !== 'string') throw new Error('solve:state.roomId: expected a string')
  if (!SOLVER_STATES.includes(m.state as SolverState))
    throw new Error(`solve:state.state: unknown state ${String(m.state)}`)
  return {
    roomId: m.roomId,
    version: typeof m.version === 'number' ? m.version : 0,
    state: m.state as SolverState,
    reason: optString(m.reason),
    message: optString(m.message),
    field: optString(m.field),
  }
}

/** Reads a `solve:progress` message. */
export function readSolveProgress(raw: unknown): SolveProgressMessage {
  const m = (raw ?? {}) as Record<string, unknown>
  if (typeof m.roomId !== 'string') throw new Error('solve:progress.roomId: expected a string')
  if (typeof m.iteration !== 'number' || typeof m.residual !== 'number') {
    throw new Error('solve:progress: iteration and residual must be numbers')
  }
  return {
    roomId: m.roomId,
    version: typeof m.version === 'number' ? m.version : 0,
    iteration: m.iteration,
    residual: m.residual,
  }
}

export type JoinResult = { ok: true; role: RoomRole } | { ok: false; error: { code: string; message: string } }

function readJoin(reply: unknown): JoinResult {
  const r = reply as { ok?: unknown; role?: unknown; error?: { code?: unknown; message?: unknown } } | null
  if (r?.ok === true && roomRoles.includes(r.role as RoomRole)) return { ok: true, role: r.role as RoomRole }
  const code = typeof r?.error?.code === 'string' ? r.error.code : 'join_failed'
  const message = typeof r?.error?.message === 'string' ? r.error.message : 'The room could not be joined.'
  return { ok: false, error: { code, message } }
}

export interface SurfaceStream {
  socket: Socket
  join(roomId: string): Promise<JoinResult>
  leave(roomId: string): void
  close(): void
}

/** Connects to the surface stream (same origin, session cookie) and routes messages to handlers. */
export function connectSurfaceStream(handlers: StreamHandlers): SurfaceStream {
  const socket = io({ withCredentials: true })
  const guard =
    <T>(read: (raw: unknown) => T, use: (msg: T) => void) =>
    (raw: unknown) => {
      try {
        use(read(raw))
      } catch (err) {
        handlers.status(socket.connected, err instanceof Error ? err.message : String(err))
      }
    }
  socket.on('connect', () => handlers.status(true))
  socket.on('disconnect', () => handlers.status(false))
  socket.on('connect_error', (err) => handlers.status(false, err.message))
  socket.on('surface', guard(readSurface, handlers.surface))
  socket.on('solve:state', guard(readSolveState, handlers.solveState))
  socket.on('solve:progress', guard(readSolveProgress, handlers.solveProgress))
  return {
    socket,
    join: (roomId) =>
      socket
        .timeout(10_000)
        .emitWithAck('room:join', { roomId })
        .then(readJoin, () =>
          readJoin({ error: { code: 'timeout', message: 'The server did not answer the room join in 10 s.' } }),
        ),
    leave: (roomId) => {
      socket.emit('room:leave', { roomId })
    },
    close: () => {
      socket.removeAllListeners()
      socket.disconnect()
    },
  }
}
