/**
 * Room documents across instances (scale-out). Each instance that holds a room subscribes to the
 * room's Redis channel. An update accepted from a client is stored in MariaDB by that instance (as
 * in one process) and then published with its version and row id; the others apply it with a
 * RemoteOrigin, which relays it to their clients and never stores it again. Duplicates cost
 * nothing: yjs skips structs a document already holds (and emits no update for them), and an
 * instance ignores its own messages. Presence (awareness) crosses the same channel. After
 * subscribing, and after every Redis reconnect, the stored room is re-read and applied, so nothing
 * published while this instance was not listening is missed.
 */
import type { Redis } from 'ioredis'
import * as decoding from 'lib0/decoding'
import * as encoding from 'lib0/encoding'
import * as awarenessProtocol from 'y-protocols/awareness'
import type { DataSource } from 'typeorm'
import { logger } from '../lib/logger.js'
import { RemoteOrigin, type LiveRoom, type RelayListener, type RoomDocs } from '../realtime/room-docs.js'
import { loadStoredRoom } from '../realtime/room-store.js'

const KIND_UPDATE = 0
const KIND_AWARENESS = 1
const CONTROL = 'vr:ctl'
const docChannel = (roomId: string) => `vr:doc:${roomId}`
/** Transaction origin of presence relayed from another instance (not published again). */
const REMOTE_PRESENCE = Symbol('remote-presence')

export interface DocBus {
  /** Asks every instance (this one included) to close the sockets of a room and/or a user; `deleted` also drops the room's live document. */
  closeWhere: (roomId?: string, userId?: string, deleted?: boolean) => void
  close: () => void
}

export function attachDocBus(opts: {
  rooms: RoomDocs
  dataSource: DataSource
  pub: Redis
  sub: Redis
  instanceId: string
  /** Closes this instance's own sockets (sync endpoint and surface stream). */
  closeLocal: (roomId?: string, userId?: string, deleted?: boolean) => void
  /** Called after Redis came back, once the rooms have caught up. */
  onReconnect?: () => void
}): DocBus {
  const { rooms, pub, sub, instanceId } = opts
  const detach = new Map<LiveRoom, () => void>()

  const publish = (roomId: string, kind: number, body: (e: encoding.Encoder) => void) => {
    const e = encoding.createEncoder()
    encoding.writeVarUint(e, kind)
    encoding.writeVarString(e, instanceId)
    body(e)
    pub
      .publish(docChannel(roomId), Buffer.from(encoding.toUint8Array(e)))
      .catch((err: unknown) =>
        logger.warn('realtime: publishing to other instances failed', { roomId, err: String(err) }),
      )
  }

  const catchUp = async (room: LiveRoom) => {
    const stored = await loadStoredRoom(opts.dataSource, room.roomId)
    if (rooms.peek(room.roomId) !== room) return
    if (stored.state) rooms.applyRemote(room, stored.state, stored.version, [])
    stored.updates.forEach((u, i) => rooms.applyRemote(room, u, stored.version, [stored.ids[i]!]))
  }

  const onLoaded = (room: LiveRoom) => {
    const relay: RelayListener = (update, origin, version, id) => {
      if (origin instanceof RemoteOrigin) return
      publish(room.roomId, KIND_UPDATE, (e) => {
        encoding.writeVarUint(e, version)
        encoding.writeVarUint(e, id ?? 0)
        encoding.writeVarUint8Array(e, update)
      })
    }
    const onPresence = (changes: { added: number[]; updated: number[]; removed: number[] }, origin: unknown) => {
      if (origin === REMOTE_PRESENCE) return
      const ids = [...changes.added, ...changes.updated, ...changes.removed]
      publish(room.roomId, KIND_AWARENESS, (e) =>
        encoding.writeVarUint8Array(e, awarenessProtocol.encodeAwarenessUpdate(room.awareness, ids)),
      )
    }
    room.relays.add(relay)
    room.awareness.on('update', onPresence)
    detach.set(room, () => room.awareness.off('update', onPresence))
    sub
      .subscribe(docChannel(room.roomId))
      .then(() => catchUp(room))
      .catch((err: unknown) =>
        logger.warn('realtime: subscribing a room failed', { roomId: room.roomId, err: String(err) }),
      )
  }
  const onFreed = (room: LiveRoom) => {
    detach.get(room)?.()
    detach.delete(room)
    if (!rooms.peek(room.roomId)) void sub.unsubscribe(docChannel(room.roomId)).catch(() => undefined)
  }

  const onMessage = (channelBytes: Buffer, message: Buffer) => {
    const channel = channelBytes.toString()
    try {
      if (channel === CONTROL) {
        const { roomId, userId, deleted } = JSON.parse(message.toString()) as {
          roomId?: string
          userId?: string
          deleted?: boolean
        }
        return opts.closeLocal(roomId, userId, deleted === true)
      }
      const room = rooms.peek(channel.slice('vr:doc:'.length))
      if (!room) return
      const d = decoding.createDecoder(new Uint8Array(message.buffer, message.byteOffset, message.byteLength))
      const kind = decoding.readVarUint(d)
      if (decoding.readVarString(d) === instanceId) return
      if (kind === KIND_UPDATE) {
        const version = decoding.readVarUint(d)
        const id = decoding.readVarUint(d)
        rooms.applyRemote(room, decoding.readVarUint8Array(d), version, id ? [id] : [])
      } else if (kind === KIND_AWARENESS) {
        awarenessProtocol.applyAwarenessUpdate(room.awareness, decoding.readVarUint8Array(d), REMOTE_PRESENCE)
      }
    } catch (err) {
      // Nothing from Redis may throw out of this callback: log and drop the message.
      logger.warn('realtime: a message from another instance was dropped', { channel, err: String(err) })
    }
  }

  let wasDown = false
  const onSubError = () => (wasDown = true)
  const onSubReady = () => {
    if (!wasDown) return
    wasDown = false
    Promise.all(rooms.all().map(catchUp))
      .then(() => opts.onReconnect?.())
      .catch((err: unknown) => logger.warn('realtime: catching up after Redis came back failed', { err: String(err) }))
  }
  sub.on('messageBuffer', onMessage)
  sub.on('error', onSubError)
  sub.on('close', onSubError)
  sub.on('ready', onSubReady)
  void sub.subscribe(CONTROL).catch(() => undefined)
  for (const room of rooms.all()) onLoaded(room)
  rooms.on('loaded', onLoaded)
  rooms.on('freed', onFreed)

  return {
    closeWhere: (roomId, userId, deleted) => {
      pub
        .publish(CONTROL, JSON.stringify({ roomId, userId, deleted }))
        .catch(() => opts.closeLocal(roomId, userId, deleted))
    },
    close: () => {
      rooms.off('loaded', onLoaded)
      rooms.off('freed', onFreed)
      sub.off('messageBuffer', onMessage)
      for (const undo of detach.values()) undo()
      detach.clear()
    },
  }
}
