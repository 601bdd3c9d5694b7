/**
 * Room documents held by two instances at once (scale-out, RoomDocs `shared`), in one process
 * against the real MariaDB, with the Redis hop replaced by direct calls so the order of events is
 * chosen by the test: each accepted update is stored exactly once (by the instance that accepted
 * it), a relayed duplicate changes nothing, and compaction by one instance never drops an edit the
 * other compacted first without relaying (the lost-update case a plain overwrite would have).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DataSource } from 'typeorm'
import * as Y from 'yjs'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import type { Running } from '../../server/main.js'
import { RemoteOrigin, RoomDocs, type LiveRoom } from '../../server/realtime/room-docs.js'
import { startTestServer } from '../helpers/test-server.js'
import { makeRoom, makeUser } from '../realtime/live-helpers.js'

let running: Running
let ds: DataSource
let ownerId: string

beforeAll(async () => {
  running = await startTestServer()
  ds = running.dataSource
  ownerId = (await makeUser(ds, 'Splicer')).id
})
afterAll(async () => {
  await running?.stop()
})

/** Moves a corner's z in a client replica of `room` and hands the update to the room. */
function clientEdit(room: LiveRoom, pointId: string, z: number): void {
  const replica = new Y.Doc()
  Y.applyUpdate(replica, Y.encodeStateAsUpdate(room.doc))
  const before = Y.encodeStateVector(replica)
  movePoint(replica, loopsOf(replica).get(0).get('id') as string, pointId, { z })
  room.applyClientUpdate(Y.encodeStateAsUpdate(replica, before), 'client')
}

const rowCount = async (roomId: string) =>
  Number(
    ((await ds.query('SELECT COUNT(*) AS n FROM `room_updates` WHERE `room_id` = ?', [roomId])) as { n: number }[])[0]!
      .n,
  )
const zOf = (doc: Y.Doc, id: string) =>
  (readRawFrame(doc) as { loops: { points: { id: string; z: number }[] }[] }).loops[0]!.points.find((p) => p.id === id)!
    .z

describe('a room held by two instances', () => {
  it('stores each update once and ignores a relayed duplicate', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const a = new RoomDocs(ds, { shared: true })
    const b = new RoomDocs(ds, { shared: true })
    const roomA = await a.acquire(roomId)
    await a.flush(roomA)
    const roomB = await b.acquire(roomId)
    const stored = await rowCount(roomId)
    // A's relay stands in for Redis: B applies what A stored, with the row id A got.
    roomA.relays.add((update, origin, version, id) => {
      if (!(origin instanceof RemoteOrigin)) b.applyRemote(roomB, update, version, id ? [id] : [])
    })
    let relayedOnB = 0
    roomB.relays.add((_u, origin) => void (origin instanceof RemoteOrigin && relayedOnB++))

    clientEdit(roomA, 'b3', 0.7)
    await a.flush(roomA)
    await b.flush(roomB)
    expect(zOf(roomB.doc, 'b3')).toBe(0.7)
    expect(await rowCount(roomId)).toBe(stored + 1)
    expect(relayedOnB).toBe(1)

    // The same bytes again (a second delivery, or the catch-up reload): nothing changes or is relayed.
    const version = roomB.version
    b.applyRemote(roomB, Y.encodeStateAsUpdate(roomA.doc), roomA.version, [])
    await b.flush(roomB)
    expect(relayedOnB).toBe(1)
    expect(roomB.version).toBe(version)
    expect(await rowCount(roomId)).toBe(stored + 1)
    await Promise.all([a.close(), b.close()])
  })

  it('keeps both edits when each instance compacts before seeing the other’s', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const a = new RoomDocs(ds, { shared: true })
    const b = new RoomDocs(ds, { shared: true })
    const roomA = await a.acquire(roomId)
    await a.flush(roomA)
    await a.release(roomA)
    const roomA2 = await a.acquire(roomId)
    const roomB = await b.acquire(roomId)
    // No relays: B compacts knowing only its own edit, then A compacts knowing only its own.
    clientEdit(roomA2, 'b1', 0.25)
    clientEdit(roomB, 'b2', 0.5)
    await Promise.all([a.flush(roomA2), b.flush(roomB)])
    await b.release(roomB)
    await a.release(roomA2)

    const fresh = new RoomDocs(ds)
    const loaded = await fresh.acquire(roomId)
    expect(zOf(loaded.doc, 'b1')).toBe(0.25)
    expect(zOf(loaded.doc, 'b2')).toBe(0.5)
    await fresh.close()
    await Promise.all([a.close(), b.close()])
  })
})
