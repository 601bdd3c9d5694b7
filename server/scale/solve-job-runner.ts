/**
 * One solve job in a worker process: drop it when a newer frame superseded it, validate the frame
 * (nothing read from Redis is trusted), preview a large cold frame coarse, solve it in the
 * process's thread pool and send every surface, state and progress to the room's clients through
 * the socket.io Redis emitter. Results are also kept in Redis for clients that join later.
 */
import type { Emitter } from '@socket.io/redis-emitter'
import type { Redis } from 'ioredis'
import { logger } from '../lib/logger.js'
import { FrameError, parseFrameJson } from '../../shared/frame/index.js'
import type { SolveHandle, SolvePool } from '../realtime/solve-pool.js'
import { COARSE_VERTICES } from '../realtime/solve-loop.js'
import { estimatedVertices, frameMeshedArea, frameStructureKey } from '../realtime/engine-link.js'
import { edgeLengthFor } from '../../shared/mesh/lattice.js'
import { solverReasonSchema, type ServerPayload, type Surface, type SurfaceEvent } from '../../shared/protocol/index.js'
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

type JobEvent = 'surface' | 'solve:state' | 'solve:progress'

/** Typed arrays as Buffer views: MessagePack (the emitter's encoding) would write them element by element. */
const wire = (s: SurfaceEvent) => ({
  ...s,
  vertices: Buffer.from(s.vertices.buffer, s.vertices.byteOffset, s.vertices.byteLength),
  triangles: Buffer.from(s.triangles.buffer, s.triangles.byteOffset, s.triangles.byteLength),
  stateVector: Buffer.from(s.stateVector.buffer, s.stateVector.byteOffset, s.stateVector.byteLength),
})

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
  const send = async <E extends JobEvent>(event: E, payload: Omit<ServerPayload<E>, 'roomId'>) => {
    const full = { roomId, ...payload } as ServerPayload<E>
    // The client reads binary fields as bytes, whatever view they arrive in (shared/protocol/binary.ts).
    emitter.to(channel(roomId)).emit(event, event === 'surface' ? wire(full as SurfaceEvent) : full)
    if (event === 'solve:progress') return
    // A joiner gets the last of each; typed arrays survive v8 serialisation as they are.
    await redis
      .multi()
      .hset(keys.out(roomId), event, encodePayload({ key: data.key, payload: full }))
      .expire(keys.out(roomId), ROOM_TTL_S)
      .exec()
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
    const once = async (f: Frame, coarse: boolean): Promise<Surface | 'cancelled' | 'failed'> => {
      const handle = ctx.pool.solve(roomId, f, {
        coarse,
        onProgress: (iteration, residual) => void send('solve:progress', { version, iteration, residual }),
      })
      ctx.onHandle(handle)
      const outcome = await handle.done
      ctx.onHandle(null)
      if (outcome.kind === 'cancelled') return 'cancelled'
      if (outcome.kind === 'failed') {
        logger.warn('worker: solve failed', { roomId, message: outcome.message })
        await send('solve:state', { version, state: 'unsettled', reason: 'solver-error', message: outcome.message })
        return 'failed'
      }
      const { kind: _k, worker: _w, ...surface } = outcome
      await send('surface', { version, stateVector, coarse, ...surface })
      return surface
    }

    if (ctx.warm.get(roomId) !== frameStructureKey(frame) && estimatedVertices(frame) > ctx.coarseAbove) {
      const edgeLength = edgeLengthFor(frameMeshedArea(frame), COARSE_VERTICES)
      const preview = await once({ ...frame, mesh: { edgeLength } }, true)
      if (preview === 'cancelled' || !(await isLatest(redis, roomId, jobId))) return 'cancelled'
    }
    const fine = await once(frame, false)
    if (fine === 'cancelled' || fine === 'failed') return fine
    ctx.warm.set(roomId, frameStructureKey(frame))
    await redis.set(keys.home(roomId), ctx.workerId, 'EX', ROOM_TTL_S)
    const { converged, reason } = fine.solver
    if (converged)
      await redis.set(keys.settled(roomId), encodePayload({ key: data.key, version, ...fine }), 'EX', ROOM_TTL_S)
    // the engine's reason is a plain string: an unknown code is named 'unknown' (shared/protocol)
    const why = solverReasonSchema.parse(reason ?? 'not-converged')
    await send('solve:state', converged ? { version, state: 'settled' } : { version, state: 'unsettled', reason: why })
    return 'solved'
  }
}
