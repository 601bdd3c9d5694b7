/**
 * Bad frames written straight into the shared document (yjs stores NaN, Infinity, strings and
 * 2001-point loops happily) and bad frame files sent to the import route. Expected: the room
 * reports 'unsettled' / 'invalid-frame' with the validator's field and reason, never crashes, and
 * solves again once the frame is fixed (server/realtime/README.md; PRODUCT.md "Frame file":
 * "a clear error names the field and the reason (self-crossing loop, hole outside, NaN, too many
 * points)"). Limits are shared/frame's own: MAX_FRAME_POINTS per loop, MAX_ESTIMATED_VERTICES.
 */
import type { Socket } from 'socket.io-client'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { MAX_ESTIMATED_VERTICES, MAX_FRAME_POINTS } from '../../shared/frame/index.js'
import { frameMap, loopsOf, makeLoop, writeFrame } from '../../shared/room-doc/schema.js'
import { starterFrame } from '../../shared/room-doc/starters.js'
import {
  connectDoc,
  connectStream,
  makeRoom,
  makeUser,
  signIn,
  startLive,
  until,
  type DocClient,
  type Live,
} from '../realtime/live-helpers.js'

interface StateEvent {
  version: number
  state: string
  reason?: string
  message?: string
  field?: string
}

let live: Live
let cookie: string
let roomId: string
let editor: DocClient
let watcher: Socket
const states: StateEvent[] = []

beforeAll(async () => {
  live = await startLive()
  const u = await makeUser(live.running.dataSource, 'Framer')
  cookie = await signIn(live.url, u.email)
  roomId = await makeRoom(live.running.dataSource, [{ userId: u.id, role: 'owner' }])
  await live.realtime.ensureRoomFrame(roomId, 'blank')
  editor = connectDoc(live.url, roomId, cookie)
  await editor.synced
  watcher = connectStream(live.url, cookie)
  watcher.on('solve:state', (s: StateEvent) => states.push(s))
  await watcher.timeout(10_000).emitWithAck('room:join', { roomId })
})
afterAll(async () => {
  watcher?.close()
  editor?.destroy()
  await live?.stop()
})

const point = (i: number) => (loopsOf(editor.doc).get(0).get('points') as Y.Array<Y.Map<unknown>>).get(i)
const circle = (n: number, r: number) =>
  Array.from({ length: n }, (_, i) => ({
    x: r * Math.cos((2 * Math.PI * i) / n),
    y: r * Math.sin((2 * Math.PI * i) / n),
    z: 0,
  }))

const cases: { name: string; edit: () => void; field: RegExp; reason: RegExp }[] = [
  {
    name: 'NaN height',
    edit: () => point(2).set('z', Number.NaN),
    field: /^loops\[0\]\.points\[2\]\.z$/,
    reason: /finite/,
  },
  {
    name: 'Infinity prestress',
    edit: () => (frameMap(editor.doc).get('prestress') as Y.Map<number>).set('warp', Infinity),
    field: /^prestress\.warp$/,
    reason: /finite/,
  },
  {
    name: '-Infinity plan coordinate',
    edit: () => point(1).set('x', -Infinity),
    field: /^loops\[0\]\.points\[1\]\.x$/,
    reason: /finite/,
  },
  {
    name: 'a string for a number',
    edit: () => point(0).set('y', 'north'),
    field: /^loops\[0\]\.points\[0\]\.y$/,
    reason: /number/,
  },
  {
    name: 'a self-crossing loop (bow tie)',
    edit: () => (point(2).set('x', 0), point(3).set('x', 6)),
    field: /^loops\[0\]\.edges\[\d\]$/,
    reason: /cross/,
  },
  {
    name: 'a degenerate loop (all points on one line)',
    edit: () => (point(2).set('y', 0), point(2).set('x', 9), point(3).set('y', 0), point(3).set('x', 3)),
    field: /^loops\[0\]/,
    reason: /cross|degenerate|area/,
  },
  {
    name: `a loop past ${MAX_FRAME_POINTS} points`,
    edit: () => {
      loopsOf(editor.doc).delete(0, 1)
      loopsOf(editor.doc).insert(0, [makeLoop('outer', circle(MAX_FRAME_POINTS + 1, 10))])
    },
    field: /^loops\[0\]\.points$/,
    reason: new RegExp(String(MAX_FRAME_POINTS)),
  },
  {
    name: `a mesh past ${MAX_ESTIMATED_VERTICES} vertices`,
    edit: () => (frameMap(editor.doc).get('mesh') as Y.Map<number>).set('edgeLength', 0.001),
    field: /^mesh\.edgeLength$/,
    reason: /too fine/,
  },
]

describe('bad frames in the shared document', () => {
  it.each(cases)(
    '$name → unsettled invalid-frame naming the field; fixed → settles again',
    async ({ edit, field, reason }) => {
      editor.doc.transact(edit)
      const server = live.realtime.rooms.peek(roomId)!
      await until(
        () =>
          server.version > 0 &&
          JSON.stringify(frameMap(server.doc).toJSON()) === JSON.stringify(frameMap(editor.doc).toJSON()),
        10_000,
        'edit reached the server',
      )
      const version = server.version
      await until(
        () => states.some((s) => s.version >= version && s.reason === 'invalid-frame'),
        20_000,
        'invalid-frame state',
      )
      const refused = states.find((s) => s.version >= version && s.reason === 'invalid-frame')!
      expect(refused.state).toBe('unsettled')
      expect(refused.field).toMatch(field)
      expect(refused.message).toMatch(reason)
      // The room is still alive: writing the blank frame back settles again.
      writeFrame(editor.doc, starterFrame('blank'))
      await until(() => server.version > version, 10_000, 'fix reached the server')
      const fixed = server.version
      await until(
        () => states.some((s) => s.version >= fixed && s.state === 'settled'),
        60_000,
        'settled after the fix',
      )
    },
    90_000,
  )
})

async function importFile(name: string, content: string) {
  const csrf = await fetch(`${live.url}/api/auth/csrf`, { headers: { cookie } })
  const token = ((await csrf.json()) as { token: string }).token
  const form = new FormData()
  form.append('file', new Blob([content]), name)
  const res = await fetch(`${live.url}/api/rooms/${roomId}/frame/import`, {
    method: 'POST',
    body: form,
    headers: { cookie, 'x-csrf-token': token },
  })
  return {
    status: res.status,
    body: (await res.json()) as { error?: { code: string; message: string; field?: string } },
  }
}

describe('bad frame files on import', () => {
  const json = (points: { x: number | string; y: number; z: number }[], extra = '') =>
    `{"format":"veilroom-frame","version":1,"units":"m"${extra},"loops":[{"role":"outer","points":${JSON.stringify(points)}}]}`

  it.each([
    ['too many points', json(circle(MAX_FRAME_POINTS + 1, 10)), /^loops\[0\]\.points$/],
    // JSON.parse reads 1e999 as Infinity.
    ['a height of 1e999', json(circle(4, 3)).replace('"z":0', '"z":1e999'), /^loops\[0\]\.points\[0\]\.z$/],
    [
      'a self-crossing loop',
      json([
        { x: 0, y: 0, z: 0 },
        { x: 6, y: 0, z: 0 },
        { x: 0, y: 6, z: 0 },
        { x: 6, y: 6, z: 0 },
      ]),
      /^loops\[0\]\.edges\[\d\]$/,
    ],
    ['a mesh too fine', json(circle(4, 3), ',"mesh":{"edgeLength":0.0001}'), /^mesh\.edgeLength$/],
  ])('answers 400 invalid_frame for %s, naming the field', async (_name, content, field) => {
    const reply = await importFile('frame.json', content)
    expect(reply.status).toBe(400)
    expect(reply.body.error?.code).toBe('invalid_frame')
    expect(reply.body.error?.field).toMatch(field)
  })

  it('answers 400 for NaN in a CSV file, naming line and column', async () => {
    const reply = await importFile('frame.csv', 'loop,x,y,z\nouter,0,0,0\nouter,6,0,NaN\nouter,6,6,0\n')
    expect(reply.status).toBe(400)
    expect(reply.body.error?.field).toMatch(/line 3/)
  })
})
