/**
 * One solve of a room's frame on a solve pool and the messages it makes, shared by the in-process
 * loop (solve-loop.ts) and the BullMQ worker (scale/solve-job-runner.ts): progress while it runs,
 * the surface as soon as it is solved, the solver state after a fine solve, and later — for a
 * settled surface of a room with seams — the pattern, laid flat as a second step in the same worker
 * (the room's next job stops it; the surface never waits for it).
 */
import type { RoomCuts } from '../../shared/pattern/index.js'
import { solverReasonSchema, type ServerPayload, type Surface } from '../../shared/protocol/index.js'
import type { Frame } from '../../shared/types.js'
import { logger } from '../lib/logger.js'
import type { SolveHandle, SolvePool } from './solve-pool.js'

export type StepEvent = 'surface' | 'solve:state' | 'solve:progress' | 'pattern'

export interface SolveStepHooks {
  /** Sends one message to the room (and keeps it for joiners, as the caller sees fit). */
  send: <E extends StepEvent>(event: E, payload: Omit<ServerPayload<E>, 'roomId'>) => void | Promise<void>
  /** The running solve, so the caller can cancel it (called once, when the job is queued). */
  onHandle?: (handle: SolveHandle) => void
  /** After the surface is sent and before its state: the caller records what the state will announce. */
  onSurface?: (surface: Surface) => void | Promise<void>
}

export interface SolveStep {
  roomId: string
  frame: Frame
  version: number
  /** The document's state vector when this frame was read (clients tell whether a surface has their edit). */
  stateVector: Uint8Array
  coarse: boolean
  cuts?: RoomCuts | undefined
}

export type StepOutcome =
  | { kind: 'cancelled' | 'failed' }
  /** `patternSent` settles once the pattern is sent, or known not to come. */
  | { kind: 'solved'; surface: Surface; patternSent: Promise<void> }

export async function runSolveStep(pool: SolvePool, step: SolveStep, hooks: SolveStepHooks): Promise<StepOutcome> {
  const { roomId, version, coarse, send } = { ...step, ...hooks }
  const handle = pool.solve(roomId, step.frame, {
    coarse,
    cuts: step.cuts,
    onProgress: (iteration, residual) => void send('solve:progress', { version, iteration, residual }),
  })
  hooks.onHandle?.(handle)
  const outcome = await handle.done
  if (outcome.kind === 'cancelled') return { kind: 'cancelled' }
  if (outcome.kind === 'failed') {
    logger.warn('realtime: solve failed', { roomId, message: outcome.message })
    await send('solve:state', { version, state: 'unsettled', reason: 'solver-error', message: outcome.message })
    return { kind: 'failed' }
  }
  const { kind: _k, worker: _w, ...surface } = outcome
  await send('surface', { version, stateVector: step.stateVector, coarse, ...surface })
  await hooks.onSurface?.(surface)
  if (!coarse) {
    const { converged, reason } = surface.solver
    // the worker's report is ours, but its reason is a plain string: name unknown codes 'unknown'
    const why = solverReasonSchema.parse(reason ?? 'not-converged')
    await send('solve:state', converged ? { version, state: 'settled' } : { version, state: 'unsettled', reason: why })
  }
  const patternSent = handle.pattern
    .then(async (pattern) => {
      if (pattern) await send('pattern', { version, ...pattern })
    })
    .catch((err: unknown) => logger.warn('realtime: sending a pattern failed', { roomId, err: String(err) }))
  return { kind: 'solved', surface, patternSent }
}
