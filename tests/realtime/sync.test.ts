/**
 * The CRDT endpoint end to end: real server, real MariaDB, y-websocket's own client provider.
 * Expected behaviour comes from the yjs documentation (concurrent map sets and array inserts both
 * survive; edits of a deleted type are discarded) and from our endpoint (server/realtime/README.md).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as encoding from 'lib0/encoding'
import WebSocket from 'ws'
import * as Y from 'yjs'
import { deletePoint, findPoint, insertPointAfter, movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import { connectDoc, makeRoom, signedInUser, startLive, until, type DocClient, type Live } from './live-helpers.js'

let live: Live
let owner: { id: string; email: string; cookie: string }
let editor: { id: string; email: string; cookie: string }
let viewer: { id: string; email: string; cookie: string }
let reviewer: { id: string; email: string; cookie: string }
let outsider: { id: string; email: string; cookie: string }
const clients: DocClient[] = []

const person = (name: string) => signedInUser(live, name)

async function seededRoom(): Promise<string> {
  const roomId = await makeRoom(live.running.dataSource, [
    { userId: owner.id, role: 'owner' },
    { userId: editor.id, role: 'editor' },
    { userId: reviewer.id, role: 'reviewer' },
    { userId: viewer.id, role: 'viewer' },
  ])
  await live.realtime.ensureRoomFrame(roomId, 'sail')
  return roomId
}

async function open(roomId: string, cookie: string): Promise<DocClient> {
  const c = connectDoc(live.url, roomId, cookie)
  clients.push(c)
  await c.synced
  return c
}

const outerId = (doc: Y.Doc) => loopsOf(doc).get(0).get('id') as string
const frameJson = (doc: Y.Doc) => JSON.stringify(readRawFrame(doc))

beforeAll(async () => {
  live = await startLive()
  owner = await person('Owner')
  editor = await person('Editor')
  viewer = await person('Viewer')
  reviewer = await person('Reviewer')
  outsider = await person('Outsider')
})

afterAll(async () => {
  for (const c of clients) c.destroy()
  await live?.stop()
})

describe('two editors converge', () => {
  it('keeps both moves of different points made at the same time', async () => {
    const roomId = await seededRoom()
    const a = await open(roomId, owner.cookie)
    const b = await open(roomId, editor.cookie)
    movePoint(a.doc, outerId(a.doc), 's1', { z: 1.11 })
    movePoint(b.doc, outerId(b.doc), 's3', { x: 8.22 })
    await until(
      () =>
        frameJson(a.doc) === frameJson(b.doc) && frameJson(a.doc).includes('1.11') && frameJson(a.doc).includes('8.22'),
      5000,
      'convergence',
    )
    const server = live.realtime.rooms.peek(roomId)!
    await until(() => frameJson(server.doc) === frameJson(a.doc), 5000, 'server doc')
  })

  it('keeps both points inserted at once after the same point', async () => {
    const roomId = await seededRoom()
    const a = await open(roomId, owner.cookie)
    const b = await open(roomId, editor.cookie)
    const idA = insertPointAfter(a.doc, outerId(a.doc), 's1', { x: 4, y: -0.5, z: 1.9 })!
    const idB = insertPointAfter(b.doc, outerId(b.doc), 's1', { x: 4, y: 0.5, z: 1.8 })!
    await until(
      () => frameJson(a.doc) === frameJson(b.doc) && !!findPoint(a.doc, outerId(a.doc), idB),
      5000,
      'both inserts',
    )
    expect(findPoint(b.doc, outerId(b.doc), idA)).toBeDefined()
    expect(loopsOf(a.doc).get(0).get('points')).toHaveProperty('length', 6)
  })

  it('drops a drag of a point that a peer deleted at the same time', async () => {
    const roomId = await seededRoom()
    const a = await open(roomId, owner.cookie)
    const b = await open(roomId, editor.cookie)
    const extra = insertPointAfter(a.doc, outerId(a.doc), 's2', { x: 9, y: 4, z: 1.5 })!
    await until(() => !!findPoint(b.doc, outerId(b.doc), extra), 5000, 'insert reaches b')
    expect(deletePoint(a.doc, outerId(a.doc), extra)).toBe(true)
    expect(movePoint(b.doc, outerId(b.doc), extra, { x: 9.7 })).toBe(true)
    await until(() => frameJson(a.doc) === frameJson(b.doc), 5000, 'convergence')
    expect(findPoint(a.doc, outerId(a.doc), extra)).toBeUndefined()
    expect(frameJson(a.doc)).not.toContain('9.7')
  })
})

describe('roles', () => {
  for (const who of ['viewer', 'reviewer'] as const) {
    it(`refuses a ${who}'s frame edit: it never reaches the server document`, async () => {
      const roomId = await seededRoom()
      const reader = await open(roomId, (who === 'viewer' ? viewer : reviewer).cookie)
      const server = live.realtime.rooms.peek(roomId)!
      const before = { frame: frameJson(server.doc), version: server.version }
      movePoint(reader.doc, outerId(reader.doc), 's2', { z: 7.77 })
      // Messages of one socket are handled in order: once the awareness sent after the edit has
      // arrived, the edit has been handled (and dropped).
      reader.provider.awareness.setLocalStateField('user', { id: 'r', name: who, color: '#777' })
      await until(() => server.awareness.getStates().has(reader.doc.clientID), 5000, 'awareness')
      expect(frameJson(server.doc)).toBe(before.frame)
      expect(server.version).toBe(before.version)
    })
  }

  it('answers a read-only client with the document (sync step 2)', async () => {
    const roomId = await seededRoom()
    const reader = await open(roomId, viewer.cookie)
    expect(frameJson(reader.doc)).toContain('"s1"')
  })
})

describe('upgrade checks', () => {
  const attempt = (path: string, headers: Record<string, string>) =>
    new Promise<number>((resolve) => {
      const ws = new WebSocket(live.url.replace(/^http/, 'ws') + path, { headers })
      ws.on('unexpected-response', (_req, res) => resolve(res.statusCode ?? 0))
      ws.on('open', () => {
        ws.close()
        resolve(101)
      })
      ws.on('error', () => undefined)
    })

  it('answers 401 without a session, 404 to a non-member, 403 to a foreign origin, 101 to a member', async () => {
    const roomId = await seededRoom()
    expect(await attempt(`/sync/${roomId}`, { origin: live.url })).toBe(401)
    expect(await attempt(`/sync/${roomId}`, { origin: live.url, cookie: outsider.cookie })).toBe(404)
    expect(await attempt(`/sync/not-a-room`, { origin: live.url, cookie: owner.cookie })).toBe(404)
    expect(await attempt(`/sync/${roomId}`, { origin: 'http://evil.example', cookie: owner.cookie })).toBe(403)
    expect(await attempt(`/sync/${roomId}`, { cookie: owner.cookie })).toBe(403)
    expect(await attempt(`/sync/${roomId}`, { origin: live.url, cookie: owner.cookie })).toBe(101)
  })
})

describe('bad input', () => {
  it('closes a socket that sends garbage; the other rooms keep working', async () => {
    const roomA = await seededRoom()
    const roomB = await seededRoom()
    const b1 = await open(roomB, owner.cookie)
    const b2 = await open(roomB, editor.cookie)
    const closed = await new Promise<number>((resolve) => {
      const ws = new WebSocket(live.url.replace(/^http/, 'ws') + `/sync/${roomA}`, {
        headers: { origin: live.url, cookie: owner.cookie },
      })
      ws.on('error', () => undefined)
      ws.on('open', () => ws.send(Buffer.from([0, 2, 0xff, 0xff, 0xff, 0xff, 0x0f, 1, 2, 3])))
      ws.on('close', (code) => resolve(code))
    })
    expect(closed).not.toBe(1000)
    movePoint(b1.doc, outerId(b1.doc), 's4', { z: 2.46 })
    await until(() => frameJson(b2.doc).includes('2.46'), 5000, 'room B still relays')
    // Room A still accepts well-behaved clients.
    const a = await open(roomA, owner.cookie)
    expect(frameJson(a.doc)).toContain('"s1"')
  })
})

describe('presence', () => {
  it("drops awareness entries that speak for another user's client; the victim's presence stays, the socket stays open", async () => {
    const roomId = await seededRoom()
    const victim = await open(roomId, owner.cookie)
    victim.provider.awareness.setLocalStateField('user', { id: owner.id, name: 'Owner', color: '#123456' })
    const server = live.realtime.rooms.peek(roomId)!
    await until(() => !!server.awareness.getStates().get(victim.doc.clientID)?.user, 5000, 'victim presence')
    // y-protocols awareness update: count, then per client id, clock, JSON state ("null" removes).
    const update = encoding.createEncoder()
    encoding.writeVarUint(update, 1)
    encoding.writeVarUint(update, victim.doc.clientID)
    encoding.writeVarUint(update, 1_000_000)
    encoding.writeVarString(update, 'null')
    const spoof = encoding.createEncoder()
    encoding.writeVarUint(spoof, 1)
    encoding.writeVarUint8Array(spoof, encoding.toUint8Array(update))
    const query = encoding.createEncoder()
    encoding.writeVarUint(query, 3) // query awareness: answered after the spoof was handled
    const ws = new WebSocket(live.url.replace(/^http/, 'ws') + `/sync/${roomId}`, {
      headers: { origin: live.url, cookie: editor.cookie },
    })
    ws.on('error', () => undefined)
    let awarenessReplies = 0
    ws.on('message', (data: Buffer) => {
      if (data[0] === 1) awarenessReplies++
    })
    await new Promise<void>((resolve) => ws.on('open', () => resolve()))
    ws.send(encoding.toUint8Array(spoof))
    ws.send(encoding.toUint8Array(query))
    // One awareness message on connect (the victim is present), one answering the query.
    await until(() => awarenessReplies >= 2, 5000, 'answer to the awareness query')
    expect(ws.readyState).toBe(WebSocket.OPEN)
    expect(server.awareness.getStates().get(victim.doc.clientID)?.user).toMatchObject({ name: 'Owner' })
    ws.close()
  })
})

describe('persistence', () => {
  it('keeps the document across a server restart', async () => {
    const roomId = await seededRoom()
    const a = await open(roomId, owner.cookie)
    movePoint(a.doc, outerId(a.doc), 's1', { x: -0.25, z: 0.75 })
    insertPointAfter(a.doc, outerId(a.doc), 's3', { x: 4, y: 8.4, z: 2 })
    const expected = frameJson(a.doc)
    await until(() => frameJson(live.realtime.rooms.peek(roomId)!.doc) === expected, 5000, 'server has the edits')
    await live.realtime.rooms.flush(live.realtime.rooms.peek(roomId)!)
    a.destroy()
    await live.stop()
    live = await startLive()
    const again = await open(roomId, owner.cookie)
    expect(frameJson(again.doc)).toBe(expected)
  })
})
