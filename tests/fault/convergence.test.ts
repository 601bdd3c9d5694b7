/**
 * Convergence over real sockets: a client that works offline merges on reconnect, and a seeded
 * random run (4 clients; moves, inserts, deletes; random disconnects) ends with every client
 * document and the server's document equal. The expectation is the CRDT's own guarantee (yjs
 * documentation: replicas that have received the same updates are in the same state, whatever
 * the order), carried through our endpoint's store-then-relay and sync-on-reconnect.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { deletePoint, insertPointAfter, movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import {
  connectDoc,
  makeRoom,
  signedInUser,
  startLive,
  until,
  type DocClient,
  type Live,
} from '../realtime/live-helpers.js'

let live: Live
let users: { id: string; cookie: string }[] = []
const clients: DocClient[] = []

beforeAll(async () => {
  live = await startLive()
  for (const name of ['Ana', 'Ben', 'Cai', 'Dee']) users.push(await signedInUser(live, name))
})
afterAll(async () => {
  for (const c of clients) c.destroy()
  users = []
  await live?.stop()
})

const frameJson = (doc: Y.Doc) => JSON.stringify(readRawFrame(doc))
const outerId = (doc: Y.Doc) => loopsOf(doc).get(0).get('id') as string
const pointIds = (doc: Y.Doc): string[] =>
  (loopsOf(doc).get(0).get('points') as Y.Array<Y.Map<unknown>>).toArray().map((p) => p.get('id') as string)

async function openRoom(n: number) {
  const roomId = await makeRoom(
    live.running.dataSource,
    users.slice(0, n).map((u, i) => ({ userId: u.id, role: i === 0 ? ('owner' as const) : ('editor' as const) })),
  )
  const docs = users.slice(0, n).map((u) => connectDoc(live.url, roomId, u.cookie))
  clients.push(...docs)
  await Promise.all(docs.map((d) => d.synced))
  return { roomId, docs }
}

/** mulberry32: a small seeded PRNG (public domain, Tommy Ettinger), so a failing run replays. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

describe('offline client', () => {
  it('keeps its offline edits and the peers’ edits, merged on reconnect', async () => {
    const { roomId, docs } = await openRoom(2)
    const [a, b] = docs as [DocClient, DocClient]
    a.provider.disconnect()
    movePoint(a.doc, outerId(a.doc), 'b1', { z: 0.31 })
    const offline = insertPointAfter(a.doc, outerId(a.doc), 'b2', { x: 6.5, y: 3, z: 0.2 })!
    movePoint(b.doc, outerId(b.doc), 'b3', { z: 0.62 })
    // b's later edit has reached the server: the relay works, so a's edit would be there by now
    // had it left the offline client.
    await until(
      () => frameJson(live.realtime.rooms.peek(roomId)!.doc).includes('0.62'),
      10_000,
      "b's edit on the server",
    )
    expect(frameJson(live.realtime.rooms.peek(roomId)!.doc)).not.toContain('0.31')
    expect(frameJson(b.doc)).not.toContain('0.31')
    a.provider.connect()
    await until(() => frameJson(a.doc) === frameJson(b.doc), 10_000, 'merge on reconnect')
    expect(frameJson(a.doc)).toContain('0.31')
    expect(frameJson(a.doc)).toContain('0.62')
    expect(pointIds(b.doc)).toContain(offline)
  })
})

describe('seeded random edits with random disconnects', () => {
  it.each([20261202, 7])(
    'seed %i: all four clients and the server end equal',
    async (seed) => {
      const random = mulberry32(seed)
      const { roomId, docs } = await openRoom(4)
      const pick = <T>(xs: T[]): T => xs[Math.floor(random() * xs.length)]!
      for (let step = 0; step < 160; step++) {
        const c = pick(docs)
        const roll = random()
        if (roll < 0.08) {
          if (c.provider.shouldConnect) c.provider.disconnect()
          else c.provider.connect()
          continue
        }
        const ids = pointIds(c.doc)
        const loop = outerId(c.doc)
        if (roll < 0.6) movePoint(c.doc, loop, pick(ids), { x: random() * 10, y: random() * 10, z: random() * 3 })
        else if (roll < 0.85 || ids.length <= 4)
          insertPointAfter(c.doc, loop, pick(ids), { x: random() * 10, y: random() * 10, z: random() })
        else deletePoint(c.doc, loop, pick(ids))
        // Let sockets breathe now and then, so edits interleave with relays rather than all at once.
        if (step % 10 === 0) await new Promise((r) => setTimeout(r, 20))
      }
      for (const d of docs) if (!d.provider.shouldConnect) d.provider.connect()
      // If every client happened to be offline at once the room was freed; it loads again on reconnect.
      const loaded = () => live.realtime.rooms.peek(roomId)
      const server = () => loaded()!.doc
      const same = () =>
        loaded() !== undefined && docs.every((d) => d.provider.synced && frameJson(d.doc) === frameJson(server()))
      await until(same, 20_000, 'convergence')
      const ids = pointIds(server())
      expect(new Set(ids).size).toBe(ids.length)
      for (const d of docs) expect(Y.encodeStateVector(d.doc)).toEqual(Y.encodeStateVector(server()))
    },
    60_000,
  )
})
