import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf } from '../../shared/room-doc/schema.js'
import { describeFrameChange } from '../../server/modules/activity/frame-change.js'
import {
  apiAs,
  connectDoc,
  makeRoom,
  signedInUser,
  startLive,
  until,
  type DocClient,
  type Live,
} from '../realtime/live-helpers.js'

// Issue 16: the rooms list's "Last change" names the editor and the edit; open pins are counted.

let live: Live
const clients: DocClient[] = []
let owner: { id: string; cookie: string }
let editor: { id: string; cookie: string }
let busy = ''
let quiet = ''

type Activity = {
  lastChange: { at: string; by: string | null; what: string } | null
  openPins: number
  myOpenPins: number
}
const activityOf = async (who: { cookie: string }) =>
  (await apiAs<{ rooms: Record<string, Activity> }>(live.url, who.cookie, 'GET', '/api/activity/rooms')).rooms

beforeAll(async () => {
  live = await startLive()
  owner = await signedInUser(live, 'Imke Owner')
  editor = await signedInUser(live, 'Tobias Editor')
  quiet = await makeRoom(live.running.dataSource, [
    { userId: owner.id, role: 'owner' },
    { userId: editor.id, role: 'editor' },
  ])
  busy = await makeRoom(live.running.dataSource, [
    { userId: owner.id, role: 'owner' },
    { userId: editor.id, role: 'editor' },
  ])
})
afterAll(async () => {
  for (const c of clients) c.destroy()
  await live?.stop()
})

describe('rooms list activity', () => {
  it('an edit through the sync socket becomes the last change, with the editor and what moved', async () => {
    const c = connectDoc(live.url, busy, editor.cookie)
    clients.push(c)
    await c.synced
    await until(() => loopsOf(c.doc).length > 0, 10_000, 'the starting frame')
    const outer = loopsOf(c.doc).get(0)
    const first = (outer.get('points') as Y.Array<Y.Map<unknown>>).get(0)
    movePoint(c.doc, outer.get('id') as string, first.get('id') as string, { x: (first.get('x') as number) + 0.5 })
    const recorded = async () => {
      await live.running.activity.recorder.flushAll()
      return (await activityOf(owner))[busy]?.lastChange?.what.startsWith('moved') ?? false
    }
    await until(recorded, 15_000, 'the move recorded', 100)
    expect((await activityOf(owner))[busy]?.lastChange).toMatchObject({ by: 'Tobias Editor', what: 'moved Outer P1' })
    // The edit is the busy room's alone: the untouched room's last change is still its membership rows.
    expect((await activityOf(owner))[quiet]!.lastChange?.what).toMatch(/^(created|joined) the room$/)
  })

  it('a pin raises the open count, and counts as mine for its author only', async () => {
    expect((await activityOf(owner))[busy]).toMatchObject({ openPins: 0, myOpenPins: 0 })
    await apiAs(live.url, editor.cookie, 'POST', `/api/rooms/${busy}/pins`, {
      x: 1,
      y: 1,
      z: 1,
      docVersion: 0,
      body: 'Check the low corner for ponding.',
    })
    expect((await activityOf(owner))[busy]).toMatchObject({ openPins: 1, myOpenPins: 0 })
    expect((await activityOf(editor))[busy]).toMatchObject({ openPins: 1, myOpenPins: 1 })
    expect((await activityOf(owner))[busy]!.lastChange).toMatchObject({ by: 'Tobias Editor', what: 'pinned a comment' })
  })
})

describe('describeFrameChange', () => {
  const frame = (pts: [string, number, number, number][], holes = 0) => ({
    loops: [
      {
        role: 'outer',
        points: pts.map(([id, x, y, z]) => ({ id, x, y, z })),
        edges: pts.map(() => ({ kind: 'rigid' })),
      },
    ].concat(Array.from({ length: holes }, () => ({ role: 'hole', points: [], edges: [] }))),
    prestress: { warp: 2, fill: 2 },
    mesh: { edgeLength: 0.3 },
  })
  type Point = [string, number, number, number]
  const square: Point[] = [
    ['a', 0, 0, 0],
    ['b', 4, 0, 0],
    ['c', 4, 4, 1],
    ['d', 0, 4, 1],
  ]
  /** The square with point `i` at (x, y, z). */
  const withPoint = (i: number, x: number, y: number, z: number) =>
    frame(square.map((p, k): Point => (k === i ? [p[0], x, y, z] : p)))
  const base = frame(square)
  it.each([
    ['moved Outer P4', withPoint(3, 0, 4.5, 1)],
    ['changed the height of Outer P2', withPoint(1, 4, 0, 0.5)],
    ['moved 2 points', frame(square.map(([id, x, y, z], k): Point => [id, k < 2 ? x + 1 : x, y, z]))],
    ['added a hole', frame(square, 1)],
    ['removed a point from Outer', frame(square.slice(0, 3))],
    ['replaced the frame', frame(square.map(([, x, y, z], k): Point => ['wxyz'[k]!, x, y, z]))],
    ['changed the prestress', { ...base, prestress: { warp: 3, fill: 2 } }],
    ['edited the frame', 'not a frame'],
  ])('%s', (words, after) => {
    expect(describeFrameChange(base, after)).toBe(words)
  })
})
