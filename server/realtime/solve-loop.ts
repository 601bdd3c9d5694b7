/**
 * Solves every loaded room after each change of its document and streams the result. A change
 * reads and validates the frame (an invalid one is reported 'unsettled'/'invalid-frame', never
 * solved), then replaces the running solve: a solve younger than `staleMs` is allowed to finish
 * first (otherwise a continuous drag would cancel every solve and nobody would see a surface), an
 * older one is cancelled. A large frame without warm state gets a coarse preview first.
 */
import * as Y from 'yjs'
import { noRoomPattern, type RoomCuts } from '../../shared/pattern/index.js'
import { readRoomFrame } from '../../shared/room-doc/read.js'
import { readRoomCuts } from '../../shared/room-doc/seams.js'
import {
  type PatternEvent,
  type ServerPayload,
  type SettledSurface,
  type SolveStateEvent,
  type SurfaceEvent,
} from '../../shared/protocol/index.js'
import { edgeLengthFor } from '../../shared/mesh/lattice.js'
import type { Frame } from '../../shared/types.js'
import { logger } from '../lib/logger.js'
import { estimatedVertices, frameMeshedArea, frameStructureKey } from './engine-link.js'
import type { LiveRoom, RoomDocs } from './room-docs.js'
import type { SolveHandle, SolvePool } from './solve-pool.js'
import { runSolveStep, type StepEvent } from './solve-step.js'
import type { RoomEmit } from '../live-room-port/index.js'

/** Vertex count a coarse preview aims at. */
export const COARSE_VERTICES = 2000

interface Watch {
  room: LiveRoom
  running: { handle: SolveHandle; startedAt: number } | null
  dirty: boolean
  scheduled: boolean
  /** Structure of the last fine solve: the worker can warm-start only a frame of the same one. */
  warmKey: string | null
  surface?: SurfaceEvent
  state?: SolveStateEvent
  /** The last 'pattern' message (flat strips of the last settled surface, or why there are none). */
  pattern?: PatternEvent
  /** The room's seams as read at the last change (undefined: none, or refused). */
  cuts?: RoomCuts | undefined
  /** The last fine surface that converged, with its pattern when the room has seams. */
  settled?: SettledSurface
  /** Version of a settled surface whose pattern is still being laid flat (a snapshot waits for it). */
  patternDue: number | null
  /** Called after each surface or state sent (getLatestSurface waits on them). */
  waiters: Set<() => void>
  onUpdate: () => void
}

export interface SolveLoop {
  /** What a client joining the room is sent first: the last surface and solve state. */
  latest: (roomId: string) => LatestEvent[] | Promise<LatestEvent[]>
  /**
   * The last settled surface of a loaded room, after waiting (up to `ms`) for the outcome of the
   * solve of its current version; null when nothing ever settled.
   */
  settledSurface: (roomId: string, ms: number) => Promise<SettledSurface | null>
  close: () => void
}

/** An event as the loop keeps it for a client that joins late. */
export type LatestEvent =
  | { event: 'surface'; payload: SurfaceEvent }
  | { event: 'solve:state'; payload: SolveStateEvent }
  | { event: 'pattern'; payload: PatternEvent }

export function createSolveLoop(opts: {
  rooms: RoomDocs
  pool: SolvePool
  emit: RoomEmit
  staleMs?: number
  coarseAbove?: number
}): SolveLoop {
  const { rooms, pool, emit } = opts
  const staleMs = opts.staleMs ?? 250
  const coarseAbove = opts.coarseAbove ?? 3 * COARSE_VERTICES
  const watches = new Map<string, Watch>()

  const send = <E extends StepEvent>(w: Watch, event: E, payload: Omit<ServerPayload<E>, 'roomId'>) => {
    const full = { roomId: w.room.roomId, ...payload } as ServerPayload<E>
    if (event === 'surface') w.surface = full as SurfaceEvent
    if (event === 'solve:state') w.state = full as SolveStateEvent
    if (event === 'pattern') {
      const pattern = (w.pattern = full as PatternEvent)
      // snapshots keep the pattern of the settled surface it was laid out from
      if (pattern.result && w.settled?.version === pattern.version)
        w.settled = { ...w.settled, pattern: pattern.result }
    }
    emit(w.room.roomId, event, full)
    if (event !== 'solve:progress') for (const wake of w.waiters) wake()
  }

  const schedule = (w: Watch) => {
    if (w.scheduled) return
    w.scheduled = true
    // Several updates in one tick (a sync step 2, a burst of moves) make one solve.
    setImmediate(() => {
      w.scheduled = false
      if (watches.get(w.room.roomId) !== w) return
      // Nothing may escape a timer callback (it would end the process): log, and keep this room's
      // last state; the next change tries again.
      try {
        kick(w)
      } catch (err) {
        logger.error('realtime: solve loop step failed', { roomId: w.room.roomId, err: String(err) })
      }
    })
  }

  const kick = (w: Watch) => {
    const read = readRoomFrame(w.room.doc)
    if (read.kind === 'empty') return
    const version = w.room.version
    const stateVector = Y.encodeStateVector(w.room.doc)
    readCuts(w, read.kind === 'frame' ? read.frame : null, version)
    if (read.kind === 'invalid') {
      w.running?.handle.cancel()
      send(w, 'solve:state', {
        version,
        state: 'unsettled',
        reason: 'invalid-frame',
        message: read.message,
        field: read.path,
      })
      return
    }
    if (w.running) {
      if (performance.now() - w.running.startedAt < staleMs) {
        w.dirty = true
        return
      }
      w.running.handle.cancel()
    }
    void run(w, read.frame, version, stateVector)
  }

  /** Reads the room's seams for the next solve; a refused or emptied set is told to the room now. */
  const readCuts = (w: Watch, frame: Frame | null, version: number) => {
    const read = readRoomCuts(w.room.doc, frame?.prestress.warpAngle ?? 0)
    w.cuts = read?.ok ? read.cuts : undefined
    const last = w.pattern
    if (read && !read.ok)
      send(w, 'pattern', {
        version,
        ...noRoomPattern({ code: 'invalid-seams', field: read.field, message: read.message }),
      })
    else if (!read && last && (last.result !== null || last.error !== null))
      send(w, 'pattern', { version, ...noRoomPattern(null) })
  }

  const solveOnce = async (
    w: Watch,
    frame: Frame,
    version: number,
    stateVector: Uint8Array,
    coarse: boolean,
  ): Promise<boolean> => {
    let mine: Watch['running'] = null
    const cuts = w.cuts
    const outcome = await runSolveStep(
      pool,
      { roomId: w.room.roomId, frame, version, stateVector, coarse, cuts },
      {
        send: (event, payload) => send(w, event, payload),
        onHandle: (handle) => (mine = w.running = { handle, startedAt: performance.now() }),
        onSurface: (surface) => {
          if (coarse) return
          w.warmKey = frameStructureKey(frame)
          if (!surface.solver.converged) return
          w.settled = { version, ...surface }
          if (cuts) w.patternDue = version
        },
      },
    )
    if (w.running === mine) w.running = null
    if (outcome.kind !== 'solved') return false
    void outcome.patternSent.then(() => {
      if (w.patternDue !== version) return
      w.patternDue = null
      for (const wake of w.waiters) wake()
    })
    return true
  }

  const run = async (w: Watch, frame: Frame, version: number, stateVector: Uint8Array) => {
    send(w, 'solve:state', { version, state: 'settling' })
    try {
      if (w.warmKey !== frameStructureKey(frame) && estimatedVertices(frame) > coarseAbove) {
        const edgeLength = edgeLengthFor(frameMeshedArea(frame), COARSE_VERTICES)
        const previewed = await solveOnce(w, { ...frame, mesh: { edgeLength } }, version, stateVector, true)
        if (!previewed && w.running) return
      }
      if (!w.dirty) await solveOnce(w, frame, version, stateVector, false)
    } catch (err) {
      logger.error('realtime: solve loop step failed', { roomId: w.room.roomId, err: String(err) })
    }
    if (w.dirty && !w.running && watches.get(w.room.roomId) === w) {
      w.dirty = false
      kick(w)
    }
  }

  const onLoaded = (room: LiveRoom) => {
    const w: Watch = {
      room,
      running: null,
      dirty: false,
      scheduled: false,
      warmKey: null,
      patternDue: null,
      waiters: new Set(),
      onUpdate: () => schedule(w),
    }
    watches.set(room.roomId, w)
    room.doc.on('update', w.onUpdate)
    schedule(w)
  }
  const onFreed = (room: LiveRoom) => {
    const w = watches.get(room.roomId)
    if (!w || w.room !== room) return
    watches.delete(room.roomId)
    room.doc.off('update', w.onUpdate)
    w.running?.handle.cancel()
    pool.forget(room.roomId)
  }
  rooms.on('loaded', onLoaded)
  rooms.on('freed', onFreed)

  return {
    latest: (roomId) => {
      const w = watches.get(roomId)
      const out: LatestEvent[] = []
      if (w?.surface) out.push({ event: 'surface', payload: w.surface })
      if (w?.state) out.push({ event: 'solve:state', payload: w.state })
      if (w?.pattern) out.push({ event: 'pattern', payload: w.pattern })
      return out
    },
    settledSurface: (roomId, ms) => {
      const w = watches.get(roomId)
      if (!w) return Promise.resolve(null)
      const target = w.room.version
      const decided = () => {
        if (w.patternDue !== null) return false
        const s = w.state
        return (w.settled?.version ?? -1) >= target || ((s?.version ?? -1) >= target && s?.state !== 'settling')
      }
      if (decided()) return Promise.resolve(w.settled ?? null)
      return new Promise((resolve) => {
        const done = () => {
          clearTimeout(timer)
          w.waiters.delete(check)
          resolve(w.settled ?? null)
        }
        const check = () => decided() && done()
        const timer = setTimeout(done, ms)
        w.waiters.add(check)
      })
    },
    close: () => {
      rooms.off('loaded', onLoaded)
      rooms.off('freed', onFreed)
      for (const w of watches.values()) w.running?.handle.cancel()
      watches.clear()
    },
  }
}
