/**
 * The solve loop of an app instance in scale-out: after each change of a loaded room (its own
 * clients' edits or another instance's), the room's frame is offered to the Redis gate; the first
 * instance to offer a new frame enqueues one BullMQ job and cancels the room's previous one, every
 * other instance holding the room finds the same frame key and skips. The job goes to the worker
 * that holds the room's warm state while it is alive, else to the shared queue (cold solve anywhere).
 * Workers send results to clients themselves; this side reads them back from Redis for joiners and
 * snapshots.
 */
import { createHash, randomUUID } from 'node:crypto'
import { Queue } from 'bullmq'
import type { Redis } from 'ioredis'
import * as Y from 'yjs'
import { readRoomFrame } from '../../shared/room-doc/read.js'
import type { RoomEmit } from '../live-room-port/index.js'
import { logger } from '../lib/logger.js'
import type { LiveRoom, RoomDocs } from '../realtime/room-docs.js'
import type { LatestEvent, SolveLoop } from '../realtime/solve-loop.js'
import type { SolveStateEvent, SurfaceEvent, VersionedSurface } from '../../shared/protocol/index.js'
import {
  GATE_SCRIPT,
  JOB_NAME,
  SHARED_QUEUE,
  WORKER_ALIVE_MS,
  decodePayload,
  encodePayload,
  keys,
  workerQueue,
  type SolveJobData,
} from './solve-jobs.js'

const frameKey = (raw: unknown): string => createHash('sha256').update(JSON.stringify(raw)).digest('base64url')

export interface ClusterSolveLoop extends SolveLoop {
  /** Offers every loaded room again, even unchanged (after Redis came back: queued jobs may be gone). */
  resubmitAll: () => void
}

export function createClusterSolveLoop(opts: { rooms: RoomDocs; redis: Redis; emit: RoomEmit }): ClusterSolveLoop {
  const { rooms, redis } = opts
  const queues = new Map<string, Queue>()
  const queue = (name: string) => {
    let q = queues.get(name)
    if (!q) {
      q = new Queue(name, { connection: redis })
      // Redis being away is logged by the connection itself (redis.ts); without a listener BullMQ prints each retry.
      q.on('error', (err) => logger.debug('realtime: solve queue error', { err: String(err) }))
      queues.set(name, q)
    }
    return q
  }
  const watches = new Map<string, { room: LiveRoom; scheduled: boolean; onUpdate: () => void }>()

  const target = async (roomId: string): Promise<string> => {
    const home = await redis.get(keys.home(roomId))
    if (!home) return SHARED_QUEUE
    const beat = await redis.hget(keys.workers, home)
    return beat !== null && Date.now() - Number(beat) < WORKER_ALIVE_MS ? workerQueue(home) : SHARED_QUEUE
  }

  const offer = async (room: LiveRoom, force: boolean): Promise<void> => {
    const read = readRoomFrame(room.doc)
    if (read.kind === 'empty') return
    // An invalid frame passes the gate too: its state is sent once, and it supersedes the last solve.
    const key = frameKey(read.kind === 'frame' ? read.frame : { invalid: read.path, message: read.message })
    const jobId = randomUUID()
    const [enqueue, previous, version] = (await redis.eval(
      GATE_SCRIPT,
      1,
      keys.latest(room.roomId),
      key,
      jobId,
      room.version,
      force ? '1' : '0',
    )) as [number, string, number]
    if (enqueue !== 1) return
    if (previous) {
      // The superseded job: a running one is cancelled, a queued one is dropped when a worker sees it is stale.
      const old = (JSON.parse(previous) as { jobId: string }).jobId
      await redis.publish(keys.cancel, old)
      await queue(SHARED_QUEUE)
        .remove(old)
        .catch(() => 0)
    }
    if (read.kind === 'invalid') {
      const payload: SolveStateEvent = {
        roomId: room.roomId,
        version,
        state: 'unsettled',
        reason: 'invalid-frame',
        message: read.message,
        field: read.path,
      }
      opts.emit(room.roomId, 'solve:state', payload)
      await redis.hset(keys.out(room.roomId), 'solve:state', encodePayload({ key, payload }))
      return
    }
    const data: SolveJobData = {
      roomId: room.roomId,
      frame: read.frame,
      key,
      version,
      stateVector: Buffer.from(Y.encodeStateVector(room.doc)).toString('base64'),
    }
    await queue(await target(room.roomId)).add(JOB_NAME, data, {
      jobId,
      removeOnComplete: true,
      removeOnFail: true,
      attempts: 3,
      backoff: { type: 'fixed', delay: 500 },
    })
  }

  const schedule = (w: { room: LiveRoom; scheduled: boolean }, force = false) => {
    if (w.scheduled && !force) return
    w.scheduled = true
    // Several updates in one tick (a sync step 2, a burst of moves) make one offer.
    setImmediate(() => {
      w.scheduled = false
      if (watches.get(w.room.roomId) !== w) return
      offer(w.room, force).catch((err: unknown) =>
        logger.warn('realtime: enqueuing a solve failed', { roomId: w.room.roomId, err: String(err) }),
      )
    })
  }

  const onLoaded = (room: LiveRoom) => {
    const w = { room, scheduled: false, onUpdate: () => schedule(w) }
    watches.set(room.roomId, w)
    room.doc.on('update', w.onUpdate)
    schedule(w)
  }
  const onFreed = (room: LiveRoom) => {
    const w = watches.get(room.roomId)
    if (!w || w.room !== room) return
    watches.delete(room.roomId)
    room.doc.off('update', w.onUpdate)
  }
  rooms.on('loaded', onLoaded)
  rooms.on('freed', onFreed)

  const stored = async (roomId: string, event: 'surface' | 'solve:state') => {
    const bytes = await redis.hgetBuffer(keys.out(roomId), event)
    // Written by our own workers (solve-job-runner.ts) in the protocol's payload shapes.
    return bytes ? (decodePayload(bytes) as { key: string; payload: SurfaceEvent | SolveStateEvent }) : null
  }

  return {
    latest: async (roomId) => {
      const out: LatestEvent[] = []
      const surface = await stored(roomId, 'surface').catch(() => null)
      if (surface) out.push({ event: 'surface', payload: surface.payload as SurfaceEvent })
      const state = await stored(roomId, 'solve:state').catch(() => null)
      if (state) out.push({ event: 'solve:state', payload: state.payload as SolveStateEvent })
      return out
    },
    settledSurface: async (roomId, ms) => {
      const w = watches.get(roomId)
      if (!w) return null
      const end = Date.now() + ms
      for (;;) {
        const read = readRoomFrame(w.room.doc)
        const key = read.kind === 'frame' ? frameKey(read.frame) : null
        const bytes = await redis.getBuffer(keys.settled(roomId))
        const settled = bytes ? (decodePayload(bytes) as VersionedSurface & { key: string }) : null
        const state = await stored(roomId, 'solve:state')
        // Instances count versions apart: a surface of this very frame carries this instance's version.
        if (settled && settled.key === key) return { ...settled, version: w.room.version } satisfies VersionedSurface
        const decided = state?.key === key && (state.payload as SolveStateEvent).state !== 'settling'
        // An older frame's surface: version -1 so a snapshot never mistakes it for the current one.
        if (decided || Date.now() > end) return settled ? { ...settled, version: -1 } : null
        await new Promise((r) => setTimeout(r, 100))
      }
    },
    resubmitAll: () => {
      for (const w of watches.values()) schedule(w, true)
    },
    close: () => {
      rooms.off('loaded', onLoaded)
      rooms.off('freed', onFreed)
      watches.clear()
      for (const q of queues.values()) void q.close()
    },
  }
}
