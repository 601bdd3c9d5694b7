/**
 * Hostile bytes on the CRDT endpoint. The rules come from the team briefing ../shared/STACK.md ("Yjs server
 * pitfalls": V1 only, a maxPayload cap, close the socket on a decode error, never merge raw client
 * bytes) and server/realtime/README.md. After every attack: the socket is closed (or the bytes change nothing),
 * another room still relays edits, and the server's heap has not grown without bound.
 */
import * as encoding from 'lib0/encoding'
import v8 from 'node:v8'
import vm from 'node:vm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import {
  connectDoc,
  makeRoom,
  makeUser,
  signIn,
  startLive,
  until,
  type DocClient,
  type Live,
} from '../realtime/live-helpers.js'
import { editUpdate, openRaw, syncMessage, type RawPeer } from './raw-sync.js'

let live: Live
let cookie: string
let userId: string
let otherRoom: string
let watchers: DocClient[] = []

beforeAll(async () => {
  live = await startLive()
  const u = await makeUser(live.running.dataSource, 'Mallory')
  userId = u.id
  cookie = await signIn(live.url, u.email)
  otherRoom = await makeRoom(live.running.dataSource, [{ userId, role: 'owner' }])
  watchers = [connectDoc(live.url, otherRoom, cookie), connectDoc(live.url, otherRoom, cookie)]
  await Promise.all(watchers.map((w) => w.synced))
})
afterAll(async () => {
  for (const w of watchers) w.destroy()
  await live?.stop()
})

/** An editor's socket on a fresh room, synced once so it holds the frame. */
async function attacker(): Promise<{ roomId: string; peer: RawPeer }> {
  const roomId = await makeRoom(live.running.dataSource, [{ userId, role: 'editor' }])
  const { peer } = await openRaw(live.url, roomId, { origin: live.url, cookie })
  if (!peer) throw new Error('upgrade refused')
  peer.send(syncMessage(0, new Uint8Array([0])))
  await until(() => peer.syncSeen.includes(1), 5000, 'initial sync')
  return { roomId, peer }
}

// node:v8 turns on --expose-gc at run time; the gc function then lives in a fresh context.
v8.setFlagsFromString('--expose-gc')
const gc = vm.runInNewContext('gc') as () => void
/** heapUsed after a full collection, so garbage not yet collected does not count as growth. */
function heapAfterGc(): number {
  gc()
  gc()
  return process.memoryUsage().heapUsed
}
const DEEP_BOUND_MB = 30
const GARBAGE_BOUND_MB = 10

let tick = 0
/** The unrelated room still relays a move from one watcher to the other. */
async function otherRoomStillRelays(): Promise<void> {
  const [a, b] = watchers as [DocClient, DocClient]
  const z = 1 + ++tick / 100
  const outer = loopsOf(a.doc).get(0).get('id') as string
  const first = (loopsOf(a.doc).get(0).get('points') as Y.Array<Y.Map<unknown>>).get(0).get('id') as string
  movePoint(a.doc, outer, first, { z })
  await until(() => JSON.stringify(readRawFrame(b.doc)).includes(String(z)), 5000, 'relay in the other room')
}

const varUint = (n: number) => {
  const e = encoding.createEncoder()
  encoding.writeVarUint(e, n)
  return encoding.toUint8Array(e)
}

const attacks: [string, () => Uint8Array][] = [
  ['garbage bytes (unknown message type)', () => Uint8Array.from([0x7f, 0x13, 0x99, 0x00, 0xfe, 0x42])],
  ['an unknown sync step', () => Uint8Array.from([0, 9, 1, 0])],
  ['a truncated varint', () => Uint8Array.from([0, 2, 0xff, 0xff])],
  ['a huge length prefix', () => Uint8Array.from([0, 2, ...varUint(0x7fffffff), 1, 2, 3])],
  ['an update whose structs run past the end', () => Uint8Array.from([0, 2, 6, 1, 1, 0xb5, 0xad, 0x01, 0])],
  ['a truncated awareness update', () => Uint8Array.from([1, 200, 1, 2, 3])],
]

describe('malformed sync messages', () => {
  it.each(attacks)('closes the socket on %s; other rooms keep working', async (_name, bytes) => {
    const { roomId, peer } = await attacker()
    const server = live.realtime.rooms.peek(roomId)!
    const version = server.version
    peer.send(bytes())
    const { code } = await peer.closed
    expect(code).not.toBe(1000)
    expect(server.version).toBe(version)
    await otherRoomStillRelays()
  })

  it('closes the socket on a message over the 2 MB maxPayload (ws 1009)', async () => {
    const { peer } = await attacker()
    peer.send(syncMessage(2, new Uint8Array(2 * 1024 * 1024 + 16)))
    const { code } = await peer.closed
    expect([1006, 1009]).toContain(code)
    await otherRoomStillRelays()
  })

  it('refuses a V2-format update with a close (issue 12 item 12)', async () => {
    const { roomId, peer } = await attacker()
    const server = live.realtime.rooms.peek(roomId)!
    const before = JSON.stringify(readRawFrame(server.doc))
    const forged = new Y.Doc()
    forged.getMap('frame').set('prestress', 'taken over')
    forged.getMap('junk').set('big', 'x'.repeat(10_000))
    peer.send(syncMessage(2, Y.encodeStateAsUpdateV2(forged)))
    expect((await peer.closed).code).toBe(4400)
    expect(JSON.stringify(readRawFrame(server.doc))).toBe(before)
    expect(server.doc.getMap('junk').size).toBe(0)
    await otherRoomStillRelays()
  })

  it('still takes V1 updates that carry only deletions', async () => {
    const { roomId, peer } = await attacker()
    const points = loopsOf(peer.doc).get(0).get('points') as Y.Array<unknown>
    const count = points.length
    const update = editUpdate(peer.doc, () => points.delete(count - 1, 1))
    expect(update[0]).toBe(0)
    peer.send(syncMessage(2, update))
    const server = live.realtime.rooms.peek(roomId)!
    await until(
      () => (loopsOf(server.doc).get(0).get('points') as Y.Array<unknown>).length === count - 1,
      5000,
      'deletion applied',
    )
  })
})

describe('crafted deep structure and memory', () => {
  it('takes a deeply nested update without crashing and frees it with the room', async () => {
    const heapBefore = heapAfterGc()
    for (let round = 0; round < 3; round++) {
      const { roomId, peer } = await attacker()
      const deep = new Y.Doc()
      Y.applyUpdate(deep, Y.encodeStateAsUpdate(peer.doc))
      // One transaction: built one set at a time, yjs walks every parent per change (quadratic).
      deep.transact(() => {
        let level = new Y.Map<unknown>()
        deep.getMap('junk').set('k', level)
        for (let i = 0; i < 20_000; i++) {
          const next = new Y.Map<unknown>()
          level.set('k', next)
          level = next
        }
      })
      const update = Y.encodeStateAsUpdate(deep, Y.encodeStateVector(peer.doc))
      expect(update.length).toBeLessThan(2 * 1024 * 1024)
      const t0 = performance.now()
      peer.send(syncMessage(2, update))
      const server = live.realtime.rooms.peek(roomId)!
      await until(() => server.doc.getMap('junk').size === 1, 20_000, 'deep update applied')
      // A figure for the report, not a timed assertion: how long one such message holds the room.
      console.log(`deep update of ${update.length} bytes applied after ${(performance.now() - t0).toFixed(0)} ms`)
      peer.ws.close()
      await peer.closed
      await otherRoomStillRelays()
      await until(() => live.realtime.rooms.peek(roomId) === undefined, 20_000, 'deep room freed')
    }
    // Measured after a full collection. One such document costs about 11.6 MB of heap (yjs 13.6,
    // measured on this machine), so a room kept alive per round would grow ≥ 35 MB over three.
    // Seen here: about 25 MB (two documents' worth) remains after all three rooms were freed; to be
    // looked into — the bound catches a leak that grows with every room, not that residue.
    const grownMb = (heapAfterGc() - heapBefore) / 1024 / 1024
    console.log(`heap grew ${grownMb.toFixed(1)} MB over three deep updates (after gc)`)
    expect(grownMb).toBeLessThan(DEEP_BOUND_MB)
  })

  it('keeps the heap bounded under a stream of garbage from many sockets', async () => {
    const heapBefore = heapAfterGc()
    for (let i = 0; i < 40; i++) {
      const { peer } = await attacker()
      peer.send(Uint8Array.from([0, 2, ...varUint(0x7fffffff)]))
      await peer.closed
    }
    await otherRoomStillRelays()
    const grownMb = (heapAfterGc() - heapBefore) / 1024 / 1024
    console.log(`heap grew ${grownMb.toFixed(1)} MB over 40 garbage sockets (after gc)`)
    expect(grownMb).toBeLessThan(GARBAGE_BOUND_MB)
  })
})
