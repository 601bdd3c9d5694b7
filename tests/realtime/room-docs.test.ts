/**
 * Persistence of live room documents against the real MariaDB: store-before-relay, loading
 * pending updates after a crash (no compaction happened), compaction with the version counter.
 * Expected states are built with yjs itself (Y.encodeStateAsUpdate of an independent replica).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DataSource } from 'typeorm'
import * as Y from 'yjs'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import { starterFrame } from '../../shared/room-doc/starters.js'
import type { Running } from '../../server/main.js'
import { RoomDocs } from '../../server/realtime/room-docs.js'
import { startTestServer } from '../helpers/test-server.js'
import { makeRoom, makeUser } from './live-helpers.js'

let running: Running
let ds: DataSource
let ownerId: string

beforeAll(async () => {
  running = await startTestServer()
  ds = running.dataSource
  ownerId = (await makeUser(ds, 'Keeper')).id
})

afterAll(async () => {
  await running?.stop()
})

/** A client replica that edits and hands its updates to the server room, like the sync endpoint. */
function replicaOf(server: Y.Doc): Y.Doc {
  const doc = new Y.Doc()
  Y.applyUpdate(doc, Y.encodeStateAsUpdate(server))
  return doc
}

async function edit(docs: RoomDocs, roomId: string, replica: Y.Doc, n: number): Promise<void> {
  const room = docs.peek(roomId)!
  const outer = loopsOf(replica).get(0).get('id') as string
  for (let i = 0; i < n; i++) {
    const before = Y.encodeStateVector(replica)
    movePoint(replica, outer, 's1', { z: 1 + i / 100 })
    room.applyClientUpdate(Y.encodeStateAsUpdate(replica, before), 'client')
    // Paced like a person dragging: each update is stored before the next arrives.
    await docs.flush(room)
  }
}

const rowCount = async (roomId: string) =>
  Number(
    ((await ds.query('SELECT COUNT(*) AS n FROM room_updates WHERE room_id = ?', [roomId])) as { n: string }[])[0]!.n,
  )

describe('RoomDocs persistence', () => {
  it('stores an update before relaying it to peers', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const docs = new RoomDocs(ds, { idleMs: 60_000 })
    await docs.ensureRoomFrame(roomId, 'sail')
    const room = await docs.acquire(roomId)
    const seen: Promise<number>[] = []
    room.relays.add(() => seen.push(rowCount(roomId)))
    const replica = replicaOf(room.doc)
    for (let i = 0; i < 3; i++) {
      await edit(docs, roomId, replica, 1)
      // the count query starts at the relay; let it finish before the next update is stored
      await Promise.all(seen)
    }
    // At each relay, that update's row was already in the table (rows 1, 2, 3).
    expect(await Promise.all(seen)).toEqual([1, 2, 3])
    await docs.release(room)
    await docs.close()
  })

  it('loads pending updates in order when the server stopped without compacting', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const first = new RoomDocs(ds, { idleMs: 60_000, compactEvery: 1000 })
    await first.ensureRoomFrame(roomId, 'sail')
    const room = await first.acquire(roomId)
    const replica = replicaOf(room.doc)
    await edit(first, roomId, replica, 7)
    expect(await rowCount(roomId)).toBe(7)
    // No release/close: as if the process had died here.
    const second = new RoomDocs(ds)
    const reloaded = await second.acquire(roomId)
    expect(JSON.stringify(readRawFrame(reloaded.doc))).toBe(JSON.stringify(readRawFrame(replica)))
    expect(reloaded.version).toBe(room.version)
    await second.release(reloaded)
    await second.close()
    await first.close()
  })

  it('compacts every N updates into room_documents with the version and deletes folded rows', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const docs = new RoomDocs(ds, { idleMs: 60_000, compactEvery: 5 })
    await docs.ensureRoomFrame(roomId, 'sail')
    const room = await docs.acquire(roomId)
    const base = room.version
    await edit(docs, roomId, replicaOf(room.doc), 12)
    const [stored] = (await ds.query('SELECT version, state FROM room_documents WHERE room_id = ?', [roomId])) as {
      version: number
      state: Buffer
    }[]
    // The seed was compacted when ensureRoomFrame let go; then compactions after edits 5 and 10.
    expect(Number(stored!.version)).toBe(base + 10)
    expect(await rowCount(roomId)).toBe(2)
    await docs.release(room)
    // The last release compacts everything: no rows left, state equals the server's doc.
    expect(await rowCount(roomId)).toBe(0)
    const [final] = (await ds.query('SELECT version, state FROM room_documents WHERE room_id = ?', [roomId])) as {
      version: number
      state: Buffer
    }[]
    expect(Number(final!.version)).toBe(base + 12)
    const check = new Y.Doc()
    Y.applyUpdate(check, final!.state)
    expect((loopsOf(check).get(0).get('points') as Y.Array<Y.Map<number>>).get(0).get('z')).toBe(1.11)
    expect(docs.peek(roomId)).toBeUndefined()
    await docs.close()
  })

  it('seeds a starting frame only into an empty document', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const docs = new RoomDocs(ds)
    expect(await docs.ensureRoomFrame(roomId, 'tent')).toBe(true)
    expect(await docs.ensureRoomFrame(roomId, 'sail')).toBe(false)
    const room = await docs.acquire(roomId)
    const frame = readRawFrame(room.doc) as { loops: unknown[] }
    expect(frame.loops).toHaveLength(starterFrame('tent').loops.length)
    await docs.release(room)
    await docs.close()
  })

  it('gives a room without any document the blank starting frame on first open', async () => {
    const roomId = await makeRoom(ds, [{ userId: ownerId, role: 'owner' }])
    const docs = new RoomDocs(ds)
    const room = await docs.acquire(roomId)
    expect(JSON.stringify(readRawFrame(room.doc))).toContain('"b1"')
    await docs.release(room)
    const [stored] = (await ds.query('SELECT version FROM room_documents WHERE room_id = ?', [roomId])) as {
      version: number
    }[]
    expect(Number(stored!.version)).toBe(1)
    await docs.close()
  })
})
