/**
 * Keeps room_activity current from the live room without a write per drag: a frame edit is held in
 * memory and stored once its burst has been quiet for `quietMs` (or when the room is freed); the
 * outcome of a solve likewise, with a small picture of the last settled surface. Every change of a
 * room — these, pins, snapshots, members, people coming and going — is announced to the members'
 * open rooms lists as `rooms:changed` (see rooms-watch.ts).
 */
import type { Transaction } from 'yjs'
import { readRawFrame } from '../../../shared/room-doc/schema.js'
import { logger } from '../../lib/logger.js'
import type { LiveRoom, RoomDocs } from '../../realtime/room-docs.js'
import type { ActivityRepository } from './activity-repository.js'
import { describeFrameChange } from './frame-change.js'
import { surfaceThumbnail } from './thumbnail.js'

interface Pending {
  edit?: { userId: string; summary: string; at: Date }
  solve?: { state: 'settled' | 'unsettled'; reason: string | null; at: Date }
  surface?: { vertices: ArrayLike<number>; triangles: ArrayLike<number> }
  timer?: NodeJS.Timeout
}

export interface ActivityRecorder {
  /** Feeds a room event the live room sent (solve state, surface, pins…). */
  onRoomEvent(roomId: string, event: string, payload: unknown): void
  /** Stores whatever is pending now (tests, shutdown). */
  flushAll(): Promise<void>
  close(): Promise<void>
}

export function createActivityRecorder(opts: {
  rooms: RoomDocs
  repo: ActivityRepository
  /** Announces that a room changed (debounced by the caller). */
  changed: (roomId: string) => void
  quietMs?: number
}): ActivityRecorder {
  const { rooms, repo, changed } = opts
  const quietMs = opts.quietMs ?? 3000
  const pending = new Map<string, Pending>()
  const detach = new Map<LiveRoom, () => void>()

  const slot = (roomId: string): Pending => {
    let p = pending.get(roomId)
    if (!p) pending.set(roomId, (p = {}))
    return p
  }

  const inFlight = new Set<Promise<void>>()
  const flush = (roomId: string): Promise<void> => {
    const done = store(roomId).finally(() => inFlight.delete(done))
    inFlight.add(done)
    return done
  }
  const store = async (roomId: string): Promise<void> => {
    const p = pending.get(roomId)
    if (!p) return
    pending.delete(roomId)
    clearTimeout(p.timer)
    try {
      if (p.edit) await repo.recordEdit(roomId, p.edit.userId, p.edit.summary, p.edit.at)
      if (p.solve) {
        const picture =
          p.solve.state === 'settled' && p.surface ? surfaceThumbnail(p.surface.vertices, p.surface.triangles) : null
        await repo.recordSolve(roomId, p.solve.state, p.solve.reason, picture, p.solve.at)
      }
      changed(roomId)
    } catch (err) {
      // A room deleted meanwhile (foreign key) or a database hiccup: the next edit tries again.
      logger.warn('activity: storing room activity failed', { roomId, err: String(err) })
    }
  }

  const later = (roomId: string): void => {
    const p = slot(roomId)
    clearTimeout(p.timer)
    p.timer = setTimeout(() => void flush(roomId), quietMs)
    p.timer.unref()
  }

  const onLoaded = (room: LiveRoom): void => {
    let before = readRawFrame(room.doc)
    const onTransaction = (tr: Transaction): void => {
      if (tr.changed.size === 0) return
      const after = readRawFrame(room.doc)
      const userId = typeof tr.origin === 'object' && tr.origin !== null ? room.editors.get(tr.origin) : undefined
      if (userId) {
        slot(room.roomId).edit = { userId, summary: describeFrameChange(before, after), at: new Date() }
        later(room.roomId)
      }
      before = after
    }
    room.doc.on('afterTransaction', onTransaction)
    detach.set(room, () => room.doc.off('afterTransaction', onTransaction))
  }
  const onFreed = (room: LiveRoom): void => {
    detach.get(room)?.()
    detach.delete(room)
    void flush(room.roomId)
  }
  rooms.on('loaded', onLoaded)
  rooms.on('freed', onFreed)
  for (const room of rooms.all()) onLoaded(room)

  return {
    onRoomEvent(roomId, event, payload) {
      const e = payload as {
        state?: string
        reason?: string
        coarse?: boolean
        vertices?: ArrayLike<number>
        triangles?: ArrayLike<number>
      }
      if (event === 'surface' && !e.coarse && e.vertices && e.triangles) {
        slot(roomId).surface = { vertices: e.vertices, triangles: e.triangles }
      } else if (event === 'solve:state' && (e.state === 'settled' || e.state === 'unsettled')) {
        slot(roomId).solve = {
          state: e.state,
          reason: e.state === 'unsettled' ? (e.reason ?? 'not-converged') : null,
          at: new Date(),
        }
        later(roomId)
      } else if (event === 'pin:changed' || event === 'pin:deleted') {
        changed(roomId)
      }
    },
    flushAll: async () => {
      await Promise.all([...[...pending.keys()].map(flush), ...inFlight])
    },
    close: async () => {
      rooms.off('loaded', onLoaded)
      rooms.off('freed', onFreed)
      for (const off of detach.values()) off()
      detach.clear()
      await Promise.all([...[...pending.keys()].map(flush), ...inFlight])
    },
  }
}
