/**
 * Issue 12 items 4, 5 and 6: withdrawn access ends a live socket at once.
 * - 4: removal answered → the removed member's next message is dropped, even though its socket has
 *   not yet answered the close (the peer does not get to decide how long it keeps writing);
 * - 5: a deleted room's sockets are closed (4404) and an edit in flight is neither stored nor relayed;
 * - 6: a member removed through an upper-case room URL is closed like one removed in lower case.
 * The removed peer stops reading its socket before the removal, so it cannot see the close frame
 * before it writes: the race an attacker would pick.
 */
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { MembershipEntity } from '../../server/db/entities/index.js'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import { ApiClient } from '../helpers/test-server.js'
import {
  connectDoc,
  connectStream,
  makeUser,
  signIn,
  startLive,
  until,
  type DocClient,
  type Live,
} from '../realtime/live-helpers.js'
import { editUpdate, openRaw, syncMessage, type RawPeer } from './raw-sync.js'

let live: Live
let owner: ApiClient
let ownerCookie: string
const open: DocClient[] = []

beforeAll(async () => {
  live = await startLive()
  owner = new ApiClient(live.url)
  await owner.signUpFresh('owner', 'Owner')
  ownerCookie = `veilroom.sid=${owner.cookie('veilroom.sid')}`
})
afterAll(async () => {
  for (const c of open) c.destroy()
  await live?.stop()
})

/** A room of the owner's with an editor, the owner's document open (it keeps the room loaded). */
async function roomWithEditor(): Promise<{
  roomId: string
  editorId: string
  editorCookie: string
  ownerDoc: DocClient
}> {
  const created = await owner.post('/api/rooms', { name: `Revoke ${randomUUID().slice(0, 6)}`, starter: 'blank' })
  const roomId = created.body.room.id as string
  const editor = await makeUser(live.running.dataSource, 'Editor')
  await live.running.dataSource
    .getRepository(MembershipEntity)
    .insert({ id: randomUUID(), roomId, userId: editor.id, role: 'editor' })
  const ownerDoc = connectDoc(live.url, roomId, ownerCookie)
  open.push(ownerDoc)
  await ownerDoc.synced
  return { roomId, editorId: editor.id, editorCookie: await signIn(live.url, editor.email), ownerDoc }
}

async function rawPeer(roomId: string, cookie: string): Promise<RawPeer> {
  const { peer } = await openRaw(live.url, roomId, { origin: live.url, cookie })
  if (!peer) throw new Error('upgrade refused')
  peer.send(syncMessage(0, new Uint8Array([0])))
  await until(() => peer.syncSeen.includes(1), 5000, 'initial sync')
  return peer
}

/** The update that moves the first outer point of the peer's copy to height z. */
function moveUpdate(doc: Y.Doc, z: number): Uint8Array {
  const outer = loopsOf(doc).get(0)
  const first = (outer.get('points') as Y.Array<Y.Map<unknown>>).get(0).get('id') as string
  return editUpdate(doc, (d) => movePoint(d, outer.get('id') as string, first, { z }))
}

/** Stops reading the peer's socket (it will not see a close frame), returns the resume function. */
function deafen(peer: RawPeer): () => void {
  const socket = (peer.ws as unknown as { _socket: { pause: () => void; resume: () => void } })._socket
  socket.pause()
  return () => socket.resume()
}

const serverFrame = (roomId: string) => JSON.stringify(readRawFrame(live.realtime.rooms.peek(roomId)!.doc))

describe('revoked sockets (issue 12 items 4, 5, 6)', () => {
  it('4: a removed editor’s message sent after the removal is dropped, then its socket ends', async () => {
    const { roomId, editorId, editorCookie } = await roomWithEditor()
    const peer = await rawPeer(roomId, editorCookie)
    const resume = deafen(peer)
    const removed = await owner.delete(`/api/rooms/${roomId}/members/${editorId}`)
    expect(removed.status).toBe(204)
    peer.send(syncMessage(2, moveUpdate(peer.doc, 9.75)))
    resume()
    const { code } = await peer.closed
    console.log(`removed editor's socket closed with ${code}`)
    // The server applies a message when it reads it; the close comes after, so it has been decided.
    expect(serverFrame(roomId)).not.toContain('9.75')
  })

  it('6: removal through an upper-case room URL closes the member’s socket', async () => {
    const { roomId, editorId, editorCookie } = await roomWithEditor()
    const peer = await rawPeer(roomId, editorCookie)
    const removed = await owner.delete(`/api/rooms/${roomId.toUpperCase()}/members/${editorId.toUpperCase()}`)
    expect(removed.status).toBe(204)
    const { code } = await peer.closed
    expect(code).toBe(4403)
  })

  it('5: deleting a room closes its sockets and drops an edit in flight', async () => {
    const { roomId, editorCookie, ownerDoc } = await roomWithEditor()
    const peer = await rawPeer(roomId, editorCookie)
    const stream = connectStream(live.url, editorCookie)
    await stream.timeout(10_000).emitWithAck('room:join', { roomId })
    const disconnected = new Promise<void>((r) => stream.once('disconnect', () => r()))
    const ownerClosed = new Promise<number>((r) => ownerDoc.provider.ws?.addEventListener('close', (e) => r(e.code)))
    const resume = deafen(peer)
    const deleted = await owner.delete(`/api/rooms/${roomId.toUpperCase()}`)
    expect(deleted.status).toBe(204)
    peer.send(syncMessage(2, moveUpdate(peer.doc, 8.25)))
    resume()
    expect((await peer.closed).code).toBe(4404)
    expect(await ownerClosed).toBe(4404)
    await disconnected
    stream.close()
    ownerDoc.destroy()
    await until(() => live.realtime.rooms.peek(roomId) === undefined, 10_000, 'the deleted room freed')
    const rows = (await live.running.dataSource.query('SELECT COUNT(*) AS n FROM `room_updates` WHERE `room_id` = ?', [
      roomId,
    ])) as { n: number }[]
    expect(Number(rows[0]!.n)).toBe(0)
    expect((await owner.get('/api/health')).status).toBe(200)
  })
})
