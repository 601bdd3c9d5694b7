/**
 * Issue 12 item 1: a well-formed yjs update whose document *shape* is not the room document's (a
 * number where a loop's map was, `loops` replaced by a scalar, …) once threw inside the solve loop's
 * setImmediate and ended the process, again on every reopen. Expected now (STACK.md "Yjs server
 * pitfalls": validate the shape, nothing thrown out of a callback): the room reports 'unsettled' /
 * 'invalid-frame' naming the path, frame.json and snapshot saving answer 409 naming it, the server
 * keeps serving other rooms, the room reopens, and undo, import or a snapshot restore repairs it.
 */
import type { Socket } from 'socket.io-client'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { readRoomFrame } from '../../shared/room-doc/read.js'
import { frameMap, loopsOf, writeFrame } from '../../shared/room-doc/schema.js'
import { starterFrame } from '../../shared/room-doc/starters.js'
import type { Frame } from '../../shared/types.js'
import { ApiClient } from '../helpers/test-server.js'
import { connectDoc, connectStream, startLive, until, type DocClient, type Live } from '../realtime/live-helpers.js'

interface StateEvent {
  roomId: string
  version: number
  state: string
  reason?: string
  message?: string
  field?: string
}

let live: Live
let api: ApiClient
let cookie: string
let watcher: Socket
const states: StateEvent[] = []
const open: DocClient[] = []

beforeAll(async () => {
  live = await startLive()
  api = new ApiClient(live.url)
  await api.signUpFresh('shaper', 'Shaper')
  cookie = `veilroom.sid=${api.cookie('veilroom.sid')}`
  watcher = connectStream(live.url, cookie)
  watcher.on('solve:state', (s: StateEvent) => states.push(s))
})
afterAll(async () => {
  watcher?.close()
  for (const c of open) c.destroy()
  await live?.stop()
})

const ORIGIN = { source: 'test' }
const points = (doc: Y.Doc, loop = 0) => loopsOf(doc).get(loop).get('points') as unknown as Y.Array<unknown>

/** A fresh room of ours with its owner's document open and the stream joined; waits for 'settled'. */
async function room(): Promise<{ roomId: string; client: DocClient; undo: Y.UndoManager }> {
  const created = await api.post('/api/rooms', { name: `Shape ${states.length}`, starter: 'blank' })
  expect(created.status).toBe(201)
  const roomId = created.body.room.id as string
  const client = connectDoc(live.url, roomId, cookie)
  open.push(client)
  await client.synced
  await watcher.timeout(10_000).emitWithAck('room:join', { roomId })
  await until(() => states.some((s) => s.roomId === roomId && s.state === 'settled'), 30_000, 'first settle')
  const undo = new Y.UndoManager(frameMap(client.doc), { trackedOrigins: new Set([ORIGIN]) })
  return { roomId, client, undo }
}

/** The newest solve state of a room after `version`. */
const latest = (roomId: string, after: number) => states.filter((s) => s.roomId === roomId && s.version > after).at(-1)

async function invalidReported(roomId: string, after: number, path: string): Promise<StateEvent> {
  await until(() => latest(roomId, after)?.reason === 'invalid-frame', 15_000, `invalid-frame for ${path}`)
  return latest(roomId, after)!
}

async function settledAgain(roomId: string, after: number): Promise<void> {
  await until(() => latest(roomId, after)?.state === 'settled', 30_000, 'settled after the repair')
}

const cases: { name: string; path: string; edit: (doc: Y.Doc) => void }[] = [
  { name: '`loops` replaced by a number', path: 'loops', edit: (doc) => frameMap(doc).set('loops', 7) },
  {
    name: 'a string where a loop should be',
    path: 'loops[1]',
    edit: (doc) => (loopsOf(doc) as unknown as Y.Array<unknown>).push(['not a loop']),
  },
  { name: 'a number where a point should be', path: 'loops[0].points[2]', edit: (doc) => points(doc).insert(2, [42]) },
  {
    name: 'a plain object where a point map should be',
    path: 'loops[0].points[0]',
    edit: (doc) => points(doc).insert(0, [{ id: 'q', x: 1, y: 1, z: 0 }]),
  },
  {
    name: 'a list where a point map should be',
    path: 'loops[0].points[1]',
    edit: (doc) => points(doc).insert(1, [new Y.Array()]),
  },
  {
    name: 'points as a map instead of a list',
    path: 'loops[0].points',
    edit: (doc) =>
      loopsOf(doc)
        .get(0)
        .set('points', new Y.Map() as never),
  },
  { name: 'prestress as a string', path: 'prestress', edit: (doc) => frameMap(doc).set('prestress', 'tight') },
  { name: 'mesh as text', path: 'mesh', edit: (doc) => frameMap(doc).set('mesh', new Y.Text('fine')) },
]

describe('malformed room documents (issue 12 item 1)', () => {
  it.each(cases.map((c, i) => [c.name, (['undo', 'import', 'restore'] as const)[i % 3]!, c] as const))(
    '%s: invalid-frame names the path, downloads refuse, %s repairs it',
    async (_name, repair, c) => {
      const { roomId, client, undo } = await room()
      let snapshotFrame: Frame | undefined
      if (repair === 'restore') {
        const snap = await api.post(`/api/rooms/${roomId}/snapshots`, { name: 'before the bad edit' })
        expect(snap.status).toBe(201)
        snapshotFrame = (await api.get(`/api/rooms/${roomId}/snapshots/${snap.body.snapshot.id}`)).body.snapshot.frame
      }
      const before = live.realtime.rooms.peek(roomId)!.version
      client.doc.transact(() => c.edit(client.doc), ORIGIN)

      const state = await invalidReported(roomId, before, c.path)
      expect(state.state).toBe('unsettled')
      expect(state.field).toBe(c.path)
      expect(state.message).toContain(c.path)
      // The same reader on this side (the client's frame view uses it) agrees.
      expect(readRoomFrame(client.doc)).toMatchObject({ kind: 'invalid', path: c.path })

      const download = await api.get(`/api/rooms/${roomId}/frame.json`)
      expect(download.status).toBe(409)
      expect(download.body.error).toMatchObject({ code: 'invalid_frame', field: c.path })
      const save = await api.post(`/api/rooms/${roomId}/snapshots`, { name: 'broken' })
      expect(save.status).toBe(409)
      expect(save.body.error.field).toBe(c.path)
      expect((await api.get('/api/health')).status).toBe(200)

      const broken = live.realtime.rooms.peek(roomId)!.version
      if (repair === 'undo') undo.undo()
      else writeFrame(client.doc, repair === 'import' ? starterFrame('sail') : snapshotFrame!, ORIGIN)
      await settledAgain(roomId, broken)
      expect((await api.get(`/api/rooms/${roomId}/frame.json`)).status).toBe(200)
      undo.destroy()
    },
    60_000,
  )

  it('a room stored with a bad update reopens, reports it, keeps its seed, and is repaired', async () => {
    const { roomId, client } = await room()
    client.doc.transact(() => frameMap(client.doc).set('loops', 'gone'), ORIGIN)
    await invalidReported(roomId, 0, 'loops')
    // Everyone leaves: the room is compacted with the bad value and freed.
    watcher.emit('room:leave', { roomId })
    client.destroy()
    await until(() => live.realtime.rooms.peek(roomId) === undefined, 15_000, 'room freed')

    // What the demo seed and room creation call: leaves the document alone, does not throw.
    expect(await live.realtime.ensureRoomFrame(roomId, 'sail')).toBe(false)
    const read = await live.realtime.getRoomFrame(roomId)
    expect(read.frame).toBeNull()
    expect(read.invalid?.path).toBe('loops')

    const again = connectDoc(live.url, roomId, cookie)
    open.push(again)
    await again.synced
    const reopened = states.length
    await watcher.timeout(10_000).emitWithAck('room:join', { roomId })
    await until(
      () => states.slice(reopened).some((s) => s.roomId === roomId && s.reason === 'invalid-frame'),
      15_000,
      'invalid-frame on reopen',
    )
    const broken = live.realtime.rooms.peek(roomId)!.version
    writeFrame(again.doc, starterFrame('blank'), ORIGIN)
    await settledAgain(roomId, broken)
  }, 60_000)
})
