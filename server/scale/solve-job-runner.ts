/**
 * One solve job in a worker process: drop it when a newer frame superseded it, validate the frame
 * (nothing read from Redis is trusted), preview a large cold frame coarse, solve it in the
 * process's thread pool (server/realtime/solve-step.ts, as in one process) and send every surface,
 * state, progress and pattern to the room's clients through the socket.io Redis emitter. Results
 * are also kept in Redis for clients that join later.
 */
import type { Emitter } from '@socket.io/redis-emitter'
import type { Redis } from 'ioredis'
import { FrameError, parseFrameJson } from '../../shared/frame/index.js'
import type { SolveHandle, SolvePool } from '../realtime/solve-pool.js'
import { COARSE_VERTICES } from '../realtime/solve-loop.js'
import { estimatedVertices, frameMeshedArea, frameStructureKey } from '../realtime/engine-link.js'
import { edgeLengthFor } from '../../shared/mesh/lattice.js'
import { roomCutsSchema, type PatternResult, type RoomCuts } from '../../shared/pattern/index.js'
import type { PatternEvent, ServerPayload, Surface, SurfaceEvent } from '../../shared/protocol/index.js'
import { runSolveStep, type StepEvent } from '../realtime/solve-step.js'
import { channel } from '../realtime/surface-stream.js'
import type { Frame } from '../../shared/types.js'
import { ROOM_TTL_S, encodePayload, keys, latestSchema, type SolveJobData } from './solve-jobs.js'

export type JobOutcome = 'solved' | 'superseded' | 'cancelled' | 'invalid' | 'failed'

export interface RunnerContext {
  redis: Redis
  /** Untyped on purpose: `send` below takes the protocol's payload types; the wire form differs. */
  emitter: Emitter
  pool: SolvePool
  workerId: string
  /** Structure of the last fine solve per room held warm in this process. */
  warm: Map<string, string>
  coarseAbove: number
  /** Registers the running handle so a cancel message can stop it. */
  onHandle: (handle: SolveHandle | null) => void
}

/** Typed arrays as Buffer views: MessagePack (the emitter's encoding) would write them element by element. */
const bytes = (a: ArrayBufferView) => Buffer.from(a.buffer, a.byteOffset, a.byteLength)
const wire = (event: StepEvent, full: unknown): unknown => {
  if (event === 'surface') {
    const s = full as SurfaceEvent
    return { ...s, vertices: bytes(s.vertices), triangles: bytes(s.triangles), stateVector: bytes(s.stateVector) }
  }
  if (event !== 'pattern') return full
  const p = full as PatternEvent
  const flat = { ...p.flat, uv: bytes(p.flat.uv), triangles: bytes(p.flat.triangles), strain: bytes(p.flat.strain) }
  const cut = {
    cutVertices: bytes(p.cutVertices),
    cutTriangles: bytes(p.cutTriangles),
    triangleStrip: bytes(p.triangleStrip),
  }
  return { ...p, ...cut, flat }
}

/** The job's seams: the instance checked them, but nothing read from Redis is trusted (a bad set flattens nothing). */
function parseCuts(raw: unknown): RoomCuts | undefined {
  const parsed = roomCutsSchema.safeParse(raw)
  return parsed.success ? parsed.data : undefined
}

export async function isLatest(redis: Redis, roomId: string, jobId: string): Promise<boolean> {
  const raw = await redis.get(keys.latest(roomId))
  if (raw === null) return false
  const parsed = latestSchema.safeParse(JSON.parse(raw))
  return parsed.success && parsed.data.jobId === jobId
}

export async function runSolveJob(jobId: string, data: SolveJobData, ctx: RunnerContext): Promise<JobOutcome> {
  const { redis, emitter, roomId } = { ...ctx, roomId: data.roomId }
  if (!(await isLatest(redis, roomId, jobId))) return 'superseded'
  const { version } = data
  const stateVector = new Uint8Array(Buffer.from(data.stateVector, 'base64'))
  /** The fine surface of this job once it settled: its pattern is stored with it for snapshots. */
  let settled: Surface | undefined
  const send = async <E extends StepEvent>(event: E, payload: Omit<ServerPayload<E>, 'roomId'>) => {
    const full = { roomId, ...payload } as ServerPayload<E>
    // a pattern comes after its job: a newer frame's job may have taken the room meanwhile
    if (event === 'pattern' && !(await isLatest(redis, roomId, jobId))) return
    // The client reads binary fields as bytes, whatever view they arrive in (shared/protocol/binary.ts).
    emitter.to(channel(roomId)).emit(event, wire(event, full))
    if (event === 'solve:progress') return
    // A joiner gets the last of each; typed arrays survive v8 serialisation as they are.
    await redis
      .multi()
      .hset(keys.out(roomId), event, encodePayload({ key: data.key, payload: full }))
      .expire(keys.out(roomId), ROOM_TTL_S)
      .exec()
    const result = event === 'pattern' ? (full as PatternEvent).result : null
    if (settled && result) await storeSettled(settled, result)
  }

  // The instance sent a validated frame, but nothing read from Redis is trusted.
  let frame: Frame
  try {
    frame = parseFrameJson(data.frame)
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err)
    const field = err instanceof FrameError ? err.field : undefined
    await send('solve:state', { version, state: 'unsettled', reason: 'invalid-frame', message, field })
    return 'invalid'
  }
  await send('solve:state', { version, state: 'settling' })
  await redis.set(keys.running(roomId), ctx.workerId, 'EX', 600)
  try {
    return await solveValid()
  } finally {
    await redis.del(keys.running(roomId))
  }

  async function solveValid(): Promise<JobOutcome> {
    const cuts = parseCuts(data.cuts)
    const once = async (f: Frame, coarse: boolean) =>
      runSolveStep(
        ctx.pool,
        { roomId, frame: f, version, stateVector, coarse, cuts },
        {
          send,
          onHandle: ctx.onHandle,
          onSurface: async (surface) => {
            if (coarse) return
            ctx.warm.set(roomId, frameStructureKey(frame))
            await redis.set(keys.home(roomId), ctx.workerId, 'EX', ROOM_TTL_S)
            if (!surface.solver.converged) return
            settled = surface
            await storeSettled(surface)
          },
        },
      )

    if (ctx.warm.get(roomId) !== frameStructureKey(frame) && estimatedVertices(frame) > ctx.coarseAbove) {
      const edgeLength = edgeLengthFor(frameMeshedArea(frame), COARSE_VERTICES)
      const preview = await once({ ...frame, mesh: { edgeLength } }, true)
      if (preview.kind === 'cancelled' || !(await isLatest(redis, roomId, jobId))) {
        ctx.onHandle(null)
        return 'cancelled'
      }
    }
    const fine = await once(frame, false)
    // the job's handle stays registered while the strips are laid flat, so a newer frame's cancel reaches them
    void (fine.kind === 'solved' ? fine.patternSent : Promise.resolve()).finally(() => ctx.onHandle(null))
    return fine.kind
  }

  async function storeSettled(surface: Surface, pattern?: PatternResult): Promise<void> {
    const settled = { key: data.key, version, ...surface, ...(pattern ? { pattern } : {}) }
    await redis.set(keys.settled(roomId), encodePayload(settled), 'EX', ROOM_TTL_S)
  }
}
