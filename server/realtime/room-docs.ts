/**
 * The map of live room documents. A room's Y.Doc is loaded from MariaDB before anyone syncs
 * against it, every accepted update is stored before it is relayed to peers, the state is
 * compacted every `compactEvery` updates or after `idleMs` without edits, and the doc is freed once
 * the last user has left and the state is persisted.
 */
import { EventEmitter } from 'node:events'
import * as Y from 'yjs'
import { Awareness } from 'y-protocols/awareness'
import type { DataSource } from 'typeorm'
import { readRoomFrame } from '../../shared/room-doc/read.js'
import { writeFrame } from '../../shared/room-doc/schema.js'
import { starterFrame, type StarterKey } from '../../shared/room-doc/starters.js'
import { logger } from '../lib/logger.js'
import { appendUpdates, loadStoredRoom, storeCompacted, storeCompactedShared } from './room-store.js'

/** Transaction origin of the load; those updates are already stored. */
const LOAD = Symbol('load')
/** Transaction origin of a starting frame written by the server. */
export const SEED = Symbol('seed')

/**
 * Transaction origin of an update another instance accepted and stored (scale-out): applied and
 * relayed here, never stored again. `ids` are its room_updates rows, which this instance's
 * compaction may then fold in.
 */
export class RemoteOrigin {
  constructor(
    readonly version: number,
    readonly ids: readonly number[],
  ) {}
}

/** `id` is the update's room_updates row when this instance stored it. */
export type RelayListener = (update: Uint8Array, origin: unknown, version: number, id?: number) => void

/** One loaded room: its document, presence, version counter and persistence queue. */
export class LiveRoom {
  readonly doc = new Y.Doc({ gc: true })
  readonly awareness = new Awareness(this.doc)
  /** Incremented on every accepted update, persisted with the compacted state. */
  version = 0
  users = 0
  /** Persist-then-relay steps run one after another so peers see updates in stored order. */
  chain: Promise<void> = Promise.resolve()
  sinceCompact = 0
  lastUpdateId = 0
  /** room_updates rows this document contains (stored here, loaded, or relayed by another instance). */
  knownIds: number[] = []
  /** True when this load found no document and wrote a starting frame. */
  seeded = false
  /** The room was deleted: nothing more is stored or relayed, the doc waits for its sockets to go. */
  discarded = false
  idleTimer: NodeJS.Timeout | undefined
  readonly relays = new Set<RelayListener>()
  /** Which socket introduced each awareness client id (checked by the sync endpoint). */
  readonly presenceOwners = new Map<number, { socket: unknown; userId: string }>()
  /** The user each update origin (a sync socket) speaks for: the rooms list names who edited. */
  readonly editors = new WeakMap<object, string>()
  /** Accepted updates waiting for the next write, oldest first. */
  unstored: { update: Uint8Array; origin: unknown; version: number }[] = []

  constructor(readonly roomId: string) {
    // The server has no presence of its own.
    this.awareness.setLocalState(null)
  }

  /**
   * Applies a client's V1 update. Throws on bytes that do not decode: the caller closes that socket.
   * Decoding first means a malformed message is refused before it can touch the document.
   */
  applyClientUpdate(update: Uint8Array, origin: unknown): void {
    Y.decodeUpdate(update)
    Y.applyUpdate(this.doc, update, origin)
  }
}

export interface RoomDocsOptions {
  compactEvery?: number
  idleMs?: number
  /**
   * Other instances edit the same rooms (scale-out): compaction merges the stored state first and
   * deletes only the update rows this document is known to contain.
   */
  shared?: boolean
}

export class RoomDocs extends EventEmitter<{ loaded: [LiveRoom]; freed: [LiveRoom] }> {
  private readonly rooms = new Map<string, Promise<LiveRoom>>()
  private readonly loaded = new Map<string, LiveRoom>()
  private readonly compactEvery: number
  private readonly idleMs: number
  private readonly shared: boolean
  private closed = false

  constructor(
    private readonly ds: DataSource,
    options: RoomDocsOptions = {},
  ) {
    super()
    this.compactEvery = options.compactEvery ?? 200
    this.idleMs = options.idleMs ?? 10_000
    this.shared = options.shared ?? false
  }

  /**
   * Applies an update another instance stored (or a reload of the stored room after a Redis outage).
   * Yjs skips what the document already holds, so a duplicate changes nothing and is not relayed.
   */
  applyRemote(room: LiveRoom, update: Uint8Array, version: number, ids: readonly number[]): void {
    try {
      Y.applyUpdate(room.doc, update, new RemoteOrigin(version, ids))
      room.knownIds.push(...ids)
      room.version = Math.max(room.version, version)
    } catch (err) {
      logger.warn('realtime: an update from another instance did not apply', { roomId: room.roomId, err: String(err) })
    }
  }

  /** The loaded room, if any (no load is started). */
  peek(roomId: string): LiveRoom | undefined {
    return this.loaded.get(roomId)
  }

  /** Every loaded room. */
  all(): LiveRoom[] {
    return [...this.loaded.values()]
  }

  /**
   * Loads (once) and holds a room; every acquire needs one release. Rejects when the load fails.
   * A room that has never had a document gets the `starter` frame (default: the blank square), so
   * nobody opens an empty board.
   */
  async acquire(roomId: string, starter: StarterKey = 'blank'): Promise<LiveRoom> {
    if (this.closed) throw new Error('realtime is shutting down')
    let pending = this.rooms.get(roomId)
    if (!pending) {
      pending = this.load(roomId, starter)
      this.rooms.set(roomId, pending)
      pending.catch(() => this.rooms.delete(roomId))
    }
    const room = await pending
    room.users++
    return room
  }

  /** Lets go of a room; the last release persists and frees it. */
  release(room: LiveRoom): Promise<void> {
    room.users--
    if (room.users > 0) return Promise.resolve()
    return this.enqueue(room, async () => {
      await this.compact(room)
      if (room.users > 0 || this.loaded.get(room.roomId) !== room) return
      this.rooms.delete(room.roomId)
      this.loaded.delete(room.roomId)
      this.dispose(room)
    })
  }

  /** Waits until every stored-then-relayed step queued so far has run. */
  flush(room: LiveRoom): Promise<void> {
    return room.chain
  }

  /**
   * Gives a room a starting frame when its document has none (room creation, demo seed). Safe to
   * call whether or not the room is live; returns once the frame is stored.
   */
  async ensureRoomFrame(roomId: string, starterKey: StarterKey): Promise<boolean> {
    const fresh = !this.rooms.has(roomId)
    const room = await this.acquire(roomId, starterKey)
    try {
      // A fresh load of an empty room has just been seeded with this starter.
      if (fresh && room.seeded) {
        await this.flush(room)
        return true
      }
      const read = readRoomFrame(room.doc)
      // A broken document is left for its members to repair (undo, import, snapshot restore),
      // never overwritten here: it may be one bad value in a frame someone worked on for hours.
      if (read.kind === 'invalid')
        logger.warn('realtime: room document holds an invalid frame', {
          roomId,
          path: read.path,
          message: read.message,
        })
      if (read.kind !== 'empty') return false
      writeFrame(room.doc, starterFrame(starterKey), SEED)
      await this.flush(room)
      return true
    } finally {
      await this.release(room)
    }
  }

  /**
   * Forgets a deleted room: pending updates are dropped and nothing more is stored (every write
   * would fail the foreign key); the doc is freed when its last holder releases it.
   */
  discard(roomId: string): void {
    const room = this.loaded.get(roomId)
    if (!room) return
    room.discarded = true
    room.unstored = []
    clearTimeout(room.idleTimer)
    room.relays.clear()
  }

  /** Persists every loaded room and frees them all. */
  async close(): Promise<void> {
    this.closed = true
    const rooms = await Promise.allSettled([...this.rooms.values()])
    for (const r of rooms) {
      if (r.status !== 'fulfilled') continue
      const room = r.value
      await this.enqueue(room, () => this.compact(room))
      this.dispose(room)
    }
    this.rooms.clear()
    this.loaded.clear()
  }

  private async load(roomId: string, starter: StarterKey): Promise<LiveRoom> {
    const stored = await loadStoredRoom(this.ds, roomId)
    const room = new LiveRoom(roomId)
    Y.transact(
      room.doc,
      () => {
        if (stored.state) Y.applyUpdate(room.doc, stored.state, LOAD)
        for (const u of stored.updates) Y.applyUpdate(room.doc, u, LOAD)
      },
      LOAD,
    )
    room.version = stored.version
    room.lastUpdateId = stored.lastUpdateId
    room.knownIds = [...stored.ids]
    room.sinceCompact = stored.updates.length
    room.doc.on('update', (update: Uint8Array, origin: unknown) => {
      if (origin !== LOAD) this.accepted(room, update, origin)
    })
    if (stored.state === null && stored.updates.length === 0) {
      writeFrame(room.doc, starterFrame(starter), SEED)
      room.seeded = true
    }
    this.loaded.set(roomId, room)
    this.emit('loaded', room)
    return room
  }

  private accepted(room: LiveRoom, update: Uint8Array, origin: unknown): void {
    if (room.discarded) return
    if (origin instanceof RemoteOrigin) {
      // Stored by the instance that accepted it; relayed in order with this room's own updates.
      const version = (room.version = Math.max(room.version + 1, origin.version))
      void this.enqueue(room, async () => {
        for (const relay of room.relays) relay(update, origin, version)
      })
      return
    }
    room.version++
    room.sinceCompact++
    room.unstored.push({ update, origin, version: room.version })
    // Updates that arrive while a write is in flight are stored together in the next one: one
    // round trip per batch keeps a busy room's relay delay near one insert, not a growing queue.
    if (room.unstored.length === 1) void this.enqueue(room, () => this.storeAndRelay(room))
    clearTimeout(room.idleTimer)
    room.idleTimer = setTimeout(() => void this.enqueue(room, () => this.compact(room)), this.idleMs)
    room.idleTimer.unref()
  }

  private async storeAndRelay(room: LiveRoom): Promise<void> {
    if (room.discarded) return
    const batch = room.unstored
    room.unstored = []
    let lastId: number | undefined
    try {
      lastId = room.lastUpdateId = await appendUpdates(this.ds, room.roomId, batch)
      // One multi-row insert takes consecutive ids (room-store.ts appendUpdates).
      for (let i = batch.length - 1; i >= 0; i--) room.knownIds.push(lastId - i)
    } catch (err) {
      // Fall back to writing the whole state; relay either way so peers do not drift apart.
      logger.error('realtime: storing updates failed', { roomId: room.roomId, err: String(err) })
      await this.compact(room)
    }
    batch.forEach(({ update, origin, version }, i) => {
      const id = lastId === undefined ? undefined : lastId - (batch.length - 1 - i)
      for (const relay of room.relays) relay(update, origin, version, id)
    })
    if (room.sinceCompact >= this.compactEvery) await this.compact(room)
  }

  private enqueue(room: LiveRoom, step: () => Promise<void>): Promise<void> {
    const next = room.chain.then(step).catch((err: unknown) => {
      logger.error('realtime: room step failed', { roomId: room.roomId, err: String(err) })
    })
    room.chain = next
    return next
  }

  /** Writes the full state; never rejects (an unhandled rejection would end the process). */
  private async compact(room: LiveRoom): Promise<void> {
    // Runs inside the room's chain, so no append can interleave; edits accepted meanwhile are
    // either inside the encoded state or get rows of their own.
    if (room.discarded || (room.sinceCompact === 0 && room.lastUpdateId === 0)) return
    try {
      const folded = room.sinceCompact
      if (this.shared) {
        const ids = room.knownIds
        room.knownIds = []
        await storeCompactedShared(
          this.ds,
          room.roomId,
          (stored) => this.mergeStored(room, stored),
          room.version,
          ids,
        ).catch((err: unknown) => {
          room.knownIds.push(...ids)
          throw err
        })
      } else {
        await storeCompacted(this.ds, room.roomId, Y.encodeStateAsUpdate(room.doc), room.version, room.lastUpdateId)
        room.knownIds = []
      }
      room.sinceCompact -= folded
      room.lastUpdateId = 0
    } catch (err) {
      logger.error('realtime: compacting a room document failed', { roomId: room.roomId, err: String(err) })
    }
  }

  /** The stored state another instance compacted may hold what this one has not seen yet. */
  private mergeStored(room: LiveRoom, stored: Buffer | null): Uint8Array {
    if (stored) this.applyRemote(room, stored, 0, [])
    return Y.encodeStateAsUpdate(room.doc)
  }

  private dispose(room: LiveRoom): void {
    clearTimeout(room.idleTimer)
    room.relays.clear()
    room.awareness.destroy()
    room.doc.destroy()
    this.emit('freed', room)
  }
}
