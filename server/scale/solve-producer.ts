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
import type { PatternEvent, SettledSurface, SolveStateEvent } from '../../shared/protocol/index.js'
import { noRoomPattern } from '../../shared/pattern/index.js'
import { readRoomCuts, type RoomCutsRead } from '../../shared/room-doc/seams.js'
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

/**
 * The room's frame and seams and the key of the solve they ask for. An invalid frame has a key too:
 * its state is sent once, and it supersedes the last solve. The seams are part of the key: a
 * changed set is laid flat again (as in one process).
 */
function readRoom(room: LiveRoom) {
  const read = readRoomFrame(room.doc)
  const cuts = readRoomCuts(room.doc, read.kind === 'frame' ? read.frame.prestress.warpAngle : 0)
  const key = frameKey(read.kind === 'frame' ? [read.frame, cuts] : read)
  return { read, cuts, key }
}

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
    const { read, cuts, key } = readRoom(room)
    if (read.kind === 'empty') return
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
    await tellCuts(room, cuts, version)
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
      cuts: cuts?.ok ? cuts.cuts : undefined,
    }
    await queue(await target(room.roomId)).add(JOB_NAME, data, {
      jobId,
      removeOnComplete: true,
      removeOnFail: true,
      attempts: 3,
      backoff: { type: 'fixed', delay: 500 },
    })
  }

  /** A refused set of seams is told to the room now, a removed one clears the last pattern (workers send the rest). */
  const tellCuts = async (room: LiveRoom, cuts: RoomCutsRead, version: number) => {
    if (cuts?.ok) return
    const out = keys.out(room.roomId)
    if (!cuts && !(await redis.hexists(out, 'pattern'))) return
    const error = cuts ? { code: 'invalid-seams', field: cuts.field, message: cuts.message } : null
    const payload: PatternEvent = { roomId: room.roomId, version, ...noRoomPattern(error) }
    opts.emit(room.roomId, 'pattern', payload)
    if (cuts) await redis.hset(out, 'pattern', encodePayload({ key: '', payload }))
    else await redis.hdel(out, 'pattern')
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

  const stored = async (roomId: string, event: LatestEvent['event']) => {
    const bytes = await redis.hgetBuffer(keys.out(roomId), event)
    // Written by our own workers (solve-job-runner.ts) and tellCuts in the protocol's payload shapes.
    return bytes ? (decodePayload(bytes) as { key: string; payload: LatestEvent['payload'] }) : null
  }

  return {
    latest: async (roomId) => {
      const out: LatestEvent[] = []
      for (const event of ['surface', 'solve:state', 'pattern'] as const) {
        const found = await stored(roomId, event).catch(() => null)
        if (found) out.push({ event, payload: found.payload } as LatestEvent)
      }
      return out
    },
    settledSurface: async (roomId, ms) => {
      const w = watches.get(roomId)
      if (!w) return null
      const end = Date.now() + ms
      for (;;) {
        const { read, key: roomKey } = readRoom(w.room)
        const key = read.kind === 'frame' ? roomKey : null
        const bytes = await redis.getBuffer(keys.settled(roomId))
        const settled = bytes ? (decodePayload(bytes) as SettledSurface & { key: string }) : null
        const state = await stored(roomId, 'solve:state')
        // Instances count versions apart: a surface of this very frame carries this instance's version.
        if (settled && settled.key === key) return { ...settled, version: w.room.version } satisfies SettledSurface
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
